package org.accordia.shift;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.TreeSet;

/**
 * Distance-based partition of reader disagreement into within-centre and between-centre parts
 * (PERMANOVA, Anderson 2001, Austral Ecology 26:32–46; McArdle &amp; Anderson 2001, Ecology
 * 82:290–297) with AMOVA variance components (Excoffier, Smouse &amp; Quattro 1992, Genetics
 * 131:479–491).
 *
 * <p>Per case c with N readers present in G centres (n_g readers in centre g):
 * SS_total = (1/N) Σ_{i&lt;j} d²_ij, SS_within = Σ_g (1/n_g) Σ_{i&lt;j in g} d²_ij,
 * SS_between = SS_total − SS_within. Cases are strata: the sums of squares and the degrees of
 * freedom df_between = Σ (G_c − 1), df_within = Σ (N_c − G_c) are added over cases, and
 * pseudo-F = (SS_between/df_between)/(SS_within/df_within). The unitless distances (or mm for
 * HD95) enter squared.
 *
 * <p>Variance components: E[SS_between,c] = (G_c − 1) σ²_w + (N_c − Σ n_g²/N_c) σ²_b, so for the
 * pooled sums E[MS_between] = σ²_w + n0 σ²_b with n0 = Σ_c (N_c − Σ_g n_g²/N_c) / Σ_c (G_c − 1),
 * the df-weighted mean of the per-case AMOVA coefficient n0_c = (N_c − Σ n_g²/N_c)/(G_c − 1).
 * σ²_within = MS_within, σ²_between = (MS_between − MS_within)/n0 (reported raw, truncated at 0
 * only inside the share Φ).
 *
 * <p>Degenerate input: a reader that is not in the reader → centre map is an error. Undefined
 * (NaN) distances: the reader with the most undefined entries in that case (ties: the later one in
 * sorted reader order) is removed from that case's matrix, repeatedly, until none is left; the
 * other readers of the case stay. A case with fewer than two remaining readers contributes
 * nothing; a case whose readers all belong to one centre contributes only to the within part
 * (SS_between = 0, df_between = 0); a centre with one reader in a case contributes no within
 * pairs but still counts in G_c. Each such event is listed in {@link PartitionResult#notes()}.
 *
 * <p>Example (vegan's dune data, Bray–Curtis, one stratum, groups of 3/5/6/6): SS_between 1.4686,
 * SS_within 2.8304, pseudo-F 2.7672, n0 = (20 − 106/20)/3 = 4.9.
 */
public final class DistancePartition {
    private DistancePartition() {
    }

    /** The partition for the observed reader → centre map. */
    public static PartitionResult partition(List<CaseDistances> cases, Map<String, String> readerCentre) {
        Design design = Design.of(cases, readerCentre);
        return design.result(design.observedGroups());
    }

    /**
     * The cases prepared once: global reader indices (sorted reader ids), squared distances of the
     * usable pairs, and the observed centre index of each reader. Package-private for the
     * permutation test, which evaluates many group assignments on the same design.
     */
    static final class Design {
        final List<String> readers;
        final List<String> centres;
        final int[] observedCentre;
        final int[][] caseReaders;      // per case: global reader indices present
        final int[][] pairA;            // per case: pair endpoints (global indices)
        final int[][] pairB;
        final double[][] pairD2;        // per case: squared distance of the pair
        final List<String> notes;

        private Design(List<String> readers, List<String> centres, int[] observedCentre, int[][] caseReaders,
                int[][] pairA, int[][] pairB, double[][] pairD2, List<String> notes) {
            this.readers = readers;
            this.centres = centres;
            this.observedCentre = observedCentre;
            this.caseReaders = caseReaders;
            this.pairA = pairA;
            this.pairB = pairB;
            this.pairD2 = pairD2;
            this.notes = notes;
        }

        static Design of(List<CaseDistances> cases, Map<String, String> readerCentre) {
            if (cases == null || readerCentre == null) {
                throw new IllegalArgumentException("cases and the reader → centre map are required");
            }
            List<String> notes = new ArrayList<>();
            List<CaseDistances> sorted = new ArrayList<>(cases);
            sorted.sort((a, b) -> a.caseId().compareTo(b.caseId()));
            // per case: the kept local indices after dropping readers with undefined distances
            List<int[]> keptPerCase = new ArrayList<>();
            TreeSet<String> used = new TreeSet<>();
            for (CaseDistances c : sorted) {
                for (String r : c.readers()) {
                    if (!readerCentre.containsKey(r)) {
                        throw new IllegalArgumentException("case " + c.caseId() + ": reader " + r
                                + " has no centre in the reader → centre map");
                    }
                }
                int[] kept = dropUndefined(c, notes);
                keptPerCase.add(kept);
                if (kept.length >= 2) {
                    for (int k : kept) {
                        used.add(c.readers().get(k));
                    }
                } else {
                    notes.add("case " + c.caseId() + ": fewer than two readers with defined distances; "
                            + "the case contributes nothing");
                }
            }
            List<String> readers = List.copyOf(used);
            Map<String, Integer> readerIndex = new TreeMap<>();
            for (int i = 0; i < readers.size(); i++) {
                readerIndex.put(readers.get(i), i);
            }
            List<String> centres = List.copyOf(new TreeSet<>(readers.stream().map(readerCentre::get).toList()));
            int[] observed = new int[readers.size()];
            for (int i = 0; i < readers.size(); i++) {
                observed[i] = centres.indexOf(readerCentre.get(readers.get(i)));
            }
            List<int[]> caseReaders = new ArrayList<>();
            List<int[]> as = new ArrayList<>();
            List<int[]> bs = new ArrayList<>();
            List<double[]> ds = new ArrayList<>();
            for (int ci = 0; ci < sorted.size(); ci++) {
                CaseDistances c = sorted.get(ci);
                int[] kept = keptPerCase.get(ci);
                if (kept.length < 2) {
                    continue;
                }
                int m = kept.length;
                int[] global = new int[m];
                for (int k = 0; k < m; k++) {
                    global[k] = readerIndex.get(c.readers().get(kept[k]));
                }
                int pairs = m * (m - 1) / 2;
                int[] a = new int[pairs];
                int[] b = new int[pairs];
                double[] d2 = new double[pairs];
                int p = 0;
                for (int i = 0; i < m; i++) {
                    for (int j = i + 1; j < m; j++) {
                        double d = c.distance(kept[i], kept[j]);
                        a[p] = global[i];
                        b[p] = global[j];
                        d2[p] = d * d;
                        p++;
                    }
                }
                caseReaders.add(global);
                as.add(a);
                bs.add(b);
                ds.add(d2);
                long centresHere = java.util.Arrays.stream(global).map(g -> observed[g]).distinct().count();
                if (centresHere < 2) {
                    notes.add("case " + c.caseId() + ": readers from one centre only; the case adds to the "
                            + "within-centre part only");
                }
            }
            return new Design(readers, centres, observed, caseReaders.toArray(new int[0][]),
                    as.toArray(new int[0][]), bs.toArray(new int[0][]), ds.toArray(new double[0][]),
                    List.copyOf(notes));
        }

        private static int[] dropUndefined(CaseDistances c, List<String> notes) {
            int m = c.readers().size();
            boolean[] alive = new boolean[m];
            java.util.Arrays.fill(alive, true);
            // sorted order of local indices by reader id, for the deterministic tie rule
            Integer[] order = new Integer[m];
            for (int i = 0; i < m; i++) {
                order[i] = i;
            }
            java.util.Arrays.sort(order, (x, y) -> c.readers().get(x).compareTo(c.readers().get(y)));
            while (true) {
                int worst = -1;
                int worstCount = 0;
                for (Integer i : order) {
                    if (!alive[i]) {
                        continue;
                    }
                    int count = 0;
                    for (int j = 0; j < m; j++) {
                        if (j != i && alive[j] && Double.isNaN(c.distance(i, j))) {
                            count++;
                        }
                    }
                    if (count > 0 && count >= worstCount) {
                        worst = i;
                        worstCount = count;
                    }
                }
                if (worst < 0) {
                    break;
                }
                alive[worst] = false;
                notes.add("case " + c.caseId() + ": reader " + c.readers().get(worst) + " removed from the case ("
                        + worstCount + " undefined distance" + (worstCount == 1 ? "" : "s") + ")");
            }
            int count = 0;
            for (boolean b : alive) {
                count += b ? 1 : 0;
            }
            int[] kept = new int[count];
            int k = 0;
            for (Integer i : order) {
                if (alive[i]) {
                    kept[k++] = i;
                }
            }
            return kept;
        }

        int[] observedGroups() {
            return observedCentre.clone();
        }

        int groupCount() {
            return centres.size();
        }

        /** Pooled pseudo-F for a group assignment (group index per global reader). */
        double pseudoF(int[] group, double[] groupSum, int[] groupSize) {
            double ssTotal = 0;
            double ssWithin = 0;
            int dfB = 0;
            int dfW = 0;
            int groups = groupSum.length;
            for (int c = 0; c < caseReaders.length; c++) {
                java.util.Arrays.fill(groupSum, 0);
                java.util.Arrays.fill(groupSize, 0);
                int[] members = caseReaders[c];
                for (int r : members) {
                    groupSize[group[r]]++;
                }
                int[] a = pairA[c];
                int[] b = pairB[c];
                double[] d2 = pairD2[c];
                double total = 0;
                for (int p = 0; p < d2.length; p++) {
                    total += d2[p];
                    int ga = group[a[p]];
                    if (ga == group[b[p]]) {
                        groupSum[ga] += d2[p];
                    }
                }
                int g = 0;
                for (int k = 0; k < groups; k++) {
                    if (groupSize[k] > 0) {
                        g++;
                        ssWithin += groupSum[k] / groupSize[k];
                    }
                }
                ssTotal += total / members.length;
                dfB += g - 1;
                dfW += members.length - g;
            }
            double ssBetween = ssTotal - ssWithin;
            return (ssBetween / dfB) / (ssWithin / dfW);
        }

        PartitionResult result(int[] group) {
            int groups = groupCount();
            double[] groupSum = new double[Math.max(groups, 1)];
            int[] groupSize = new int[Math.max(groups, 1)];
            double ssTotal = 0;
            double ssWithin = 0;
            int dfB = 0;
            int dfW = 0;
            double n0Numerator = 0;
            for (int c = 0; c < caseReaders.length; c++) {
                java.util.Arrays.fill(groupSum, 0);
                java.util.Arrays.fill(groupSize, 0);
                int[] members = caseReaders[c];
                int n = members.length;
                for (int r : members) {
                    groupSize[group[r]]++;
                }
                double total = 0;
                for (int p = 0; p < pairD2[c].length; p++) {
                    total += pairD2[c][p];
                    int ga = group[pairA[c][p]];
                    if (ga == group[pairB[c][p]]) {
                        groupSum[ga] += pairD2[c][p];
                    }
                }
                int g = 0;
                double sumSq = 0;
                for (int k = 0; k < groupSum.length; k++) {
                    if (groupSize[k] > 0) {
                        g++;
                        ssWithin += groupSum[k] / groupSize[k];
                        sumSq += (double) groupSize[k] * groupSize[k];
                    }
                }
                ssTotal += total / n;
                dfB += g - 1;
                dfW += n - g;
                n0Numerator += n - sumSq / n;
            }
            double ssBetween = ssTotal - ssWithin;
            double msB = dfB > 0 ? ssBetween / dfB : Double.NaN;
            double msW = dfW > 0 ? ssWithin / dfW : Double.NaN;
            double f = msB / msW;
            double n0 = dfB > 0 ? n0Numerator / dfB : Double.NaN;
            double s2b = (msB - msW) / n0;
            double s2w = msW;
            double b = Math.max(0, s2b);
            double share = (b + s2w) > 0 ? b / (b + s2w) : Double.NaN;
            List<String> allNotes = new ArrayList<>(notes);
            if (dfB == 0) {
                allNotes.add("no case has readers from two centres; the between-centre part is undefined");
            }
            return new PartitionResult(ssBetween, ssWithin, ssTotal, dfB, dfW, f, n0, s2b, s2w, share,
                    caseReaders.length, readers, allNotes);
        }
    }
}
