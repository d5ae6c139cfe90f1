package org.accordia.consensus;

import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.accordia.agreement.PatternHistogram;

/** Test helpers: fixture loading, histograms built voxel by voxel, random masks. */
final class Fixtures {
    private Fixtures() {
    }

    static String resource(String path) {
        try (InputStream in = Fixtures.class.getResourceAsStream(path)) {
            if (in == null) {
                throw new IllegalStateException("missing test resource " + path);
            }
            return new String(in.readAllBytes(), StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new IllegalStateException(e);
        }
    }

    /** Binary masks of one fixture file of make_fixtures.py: [reader][voxel]. */
    static boolean[][] readMasks(String path) {
        String[] lines = resource(path).split("\n");
        String[] head = lines[0].trim().split(" ");
        int n = Integer.parseInt(head[0]) * Integer.parseInt(head[1]) * Integer.parseInt(head[2]);
        int r = Integer.parseInt(head[3]);
        boolean[][] m = new boolean[r][n];
        for (int j = 0; j < r; j++) {
            String row = lines[1 + j].trim();
            for (int i = 0; i < n; i++) {
                m[j][i] = row.charAt(i) == '1';
            }
        }
        return m;
    }

    static int[] dims(String path) {
        String[] head = resource(path).split("\n")[0].trim().split(" ");
        return new int[] {Integer.parseInt(head[0]), Integer.parseInt(head[1]), Integer.parseInt(head[2])};
    }

    /** The decision-pattern histogram of binary masks, by a plain voxel loop. */
    static PatternHistogram histogram(boolean[][] masks) {
        int r = masks.length;
        java.util.TreeMap<Long, Long> counts = new java.util.TreeMap<>();
        for (int i = 0; i < masks[0].length; i++) {
            counts.merge(pattern(masks, i), 1L, Long::sum);
        }
        long[] p = new long[counts.size()];
        long[] c = new long[counts.size()];
        int k = 0;
        for (var e : counts.entrySet()) {
            p[k] = e.getKey();
            c[k++] = e.getValue();
        }
        return new PatternHistogram(r, p, c);
    }

    static long pattern(boolean[][] masks, int i) {
        long b = 0;
        for (int j = 0; j < masks.length; j++) {
            if (masks[j][i]) {
                b |= 1L << j;
            }
        }
        return b;
    }

    /** Random binary masks: one perturbed ball per reader (own radius and shift) with random voxel flips. */
    static boolean[][] randomMasks(SplittableRandom rnd, int readers, int nx, int ny, int nz) {
        boolean[][] m = new boolean[readers][nx * ny * nz];
        double cx = nx / 2.0;
        double cy = ny / 2.0;
        double cz = nz / 2.0;
        double base = Math.min(nx, Math.min(ny, nz)) * (0.15 + 0.2 * rnd.nextDouble());
        for (int j = 0; j < readers; j++) {
            double rad = base * (0.7 + 0.6 * rnd.nextDouble());
            double sx = rnd.nextDouble() * 2 - 1;
            double sy = rnd.nextDouble() * 2 - 1;
            double flip = rnd.nextDouble() * 0.1;
            for (int z = 0; z < nz; z++) {
                for (int y = 0; y < ny; y++) {
                    for (int x = 0; x < nx; x++) {
                        double d = Math.sqrt(sq(x - cx - sx) + sq(y - cy - sy) + sq(z - cz));
                        boolean in = d <= rad;
                        if (rnd.nextDouble() < flip) {
                            in = !in;
                        }
                        m[j][x + nx * (y + ny * z)] = in;
                    }
                }
            }
        }
        return m;
    }

    private static double sq(double v) {
        return v * v;
    }

    /** Parsed output of staple_itk. */
    record ItkOutput(double prior, int elapsedIterations, double[] p, double[] q, double[] wVoxel,
            List<long[]> patternCounts, List<Double> patternW) {
    }

    static ItkOutput readItk(String path) {
        double prior = Double.NaN;
        int it = -1;
        double[] p = null;
        double[] q = null;
        double[] wv = null;
        List<long[]> pc = new ArrayList<>();
        List<Double> pw = new ArrayList<>();
        for (String line : resource(path).split("\n")) {
            String[] t = line.trim().split(" ");
            switch (t[0]) {
                case "prior" -> prior = Double.parseDouble(t[1]);
                case "elapsed_iterations" -> it = Integer.parseInt(t[1]);
                case "p" -> p = doubles(t);
                case "q" -> q = doubles(t);
                case "w_voxel" -> wv = doubles(t);
                case "pattern" -> {
                    pc.add(new long[] {Long.parseLong(t[1]), Long.parseLong(t[2])});
                    pw.add(Double.parseDouble(t[3]));
                }
                default -> {
                }
            }
        }
        return new ItkOutput(prior, it, p, q, wv, pc, pw);
    }

    private static double[] doubles(String[] t) {
        double[] d = new double[t.length - 1];
        for (int i = 1; i < t.length; i++) {
            d[i - 1] = Double.parseDouble(t[i]);
        }
        return d;
    }
}
