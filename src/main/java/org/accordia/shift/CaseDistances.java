package org.accordia.shift;

import java.util.List;

/**
 * The readers present on one case of one label and their pairwise distance matrix (for example
 * 1 − Jaccard, HD95 in mm, or 1 − NSD). {@code distances[i][j]} is the distance between
 * {@code readers.get(i)} and {@code readers.get(j)}; the matrix must be square, symmetric, with a
 * zero diagonal and non-negative entries. {@code NaN} marks an undefined distance (for example
 * HD95 when one mask is empty); see {@link DistancePartition} for how such entries are handled.
 */
public record CaseDistances(String caseId, List<String> readers, double[][] distances) {
    public CaseDistances {
        if (caseId == null || readers == null || distances == null) {
            throw new IllegalArgumentException("case id, readers and distances are required");
        }
        readers = List.copyOf(readers);
        if (distances.length != readers.size()) {
            throw new IllegalArgumentException("case " + caseId + ": " + readers.size() + " readers but a "
                    + distances.length + "-row distance matrix");
        }
        if (readers.stream().distinct().count() != readers.size()) {
            throw new IllegalArgumentException("case " + caseId + ": a reader is listed twice");
        }
        double[][] copy = new double[distances.length][];
        for (int i = 0; i < distances.length; i++) {
            if (distances[i] == null || distances[i].length != readers.size()) {
                throw new IllegalArgumentException("case " + caseId + ": distance matrix is not square");
            }
            copy[i] = distances[i].clone();
        }
        for (int i = 0; i < copy.length; i++) {
            for (int j = 0; j < copy.length; j++) {
                double a = copy[i][j];
                double b = copy[j][i];
                if (i == j) {
                    if (!(a == 0 || Double.isNaN(a))) {
                        throw new IllegalArgumentException("case " + caseId + ": non-zero diagonal");
                    }
                    continue;
                }
                if (Double.isNaN(a) != Double.isNaN(b)
                        || (!Double.isNaN(a) && Math.abs(a - b) > 1e-9 * Math.max(1, Math.abs(a)))) {
                    throw new IllegalArgumentException("case " + caseId + ": distance matrix is not symmetric");
                }
                if (a < 0 || Double.isInfinite(a)) {
                    throw new IllegalArgumentException("case " + caseId + ": negative or infinite distance");
                }
            }
        }
        distances = copy;
    }

    /** A defensive copy of the distance matrix. */
    @Override
    public double[][] distances() {
        double[][] copy = new double[distances.length][];
        for (int i = 0; i < copy.length; i++) {
            copy[i] = distances[i].clone();
        }
        return copy;
    }

    double distance(int i, int j) {
        return distances[i][j];
    }
}
