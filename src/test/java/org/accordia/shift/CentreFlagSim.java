package org.accordia.shift;

import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Random;
import java.util.TreeMap;

import org.accordia.bench.BinomialInterval;
import org.junit.jupiter.api.Test;

/**
 * Simulation of the centre-flag decision at the level the rule consumes (off by default; run with
 * {@code mvn -o -q test -Dtest=CentreFlagSim -Daccordia.sim.runs=200}). Much faster than the full
 * pipeline, so it covers the partial-null configurations the strong family-wise error control must
 * survive (one centre far off, two centres off, +Δ and −Δ); `accordia calibrate` checks the same
 * criteria through the full pipeline.
 *
 * <p>Model (our own): every case has a spherical structure of radius R_k ~ U(7, 10) mm; reader i's
 * boundary on case k is a sphere of radius R_k + s_g(i) + b_i + e_ik centred at a random offset
 * (sd 0.4 mm per axis) — s_g the centre's planted shift, b_i ~ U(−0.3, 0.3) mm the reader's bias
 * (or +1.5 mm for the one wide reader), e_ik ~ N(0, 0.2²) mm. Distances: 1 − Jaccard of the two
 * spheres (exact lens volume). Measures against one common reference per case (the sphere of the
 * mean radius): signed surface r − r̄, volume ratio (r/r̄)³; against the other centres' consensus:
 * r − mean of the other centres' radii. Truth: Δ_c = s_c − mean_{d≠c} s_d (reader biases have
 * population mean 0).
 */
class CentreFlagSim {

    record Scenario(String name, int[] readers, double[] shift, int wideReader, boolean lrt) {
    }

    static double jaccardDistance(double a, double b, double[] ca, double[] cb) {
        double d = Math.sqrt(Math.pow(ca[0] - cb[0], 2) + Math.pow(ca[1] - cb[1], 2) + Math.pow(ca[2] - cb[2], 2));
        double va = 4.0 / 3 * Math.PI * a * a * a;
        double vb = 4.0 / 3 * Math.PI * b * b * b;
        double inter;
        if (d >= a + b) {
            inter = 0;
        } else if (d <= Math.abs(a - b)) {
            inter = Math.min(va, vb);
        } else {
            inter = Math.PI * Math.pow(a + b - d, 2) * (d * d + 2 * d * (a + b) - 3 * Math.pow(a - b, 2)) / (12 * d);
        }
        return 1 - inter / (va + vb - inter);
    }

    static LabelShiftInput study(Scenario sc, Random random) {
        Map<String, String> centreOf = new TreeMap<>();
        List<String> ids = new ArrayList<>();
        List<Integer> groupOf = new ArrayList<>();
        for (int g = 0; g < sc.readers().length; g++) {
            for (int r = 0; r < sc.readers()[g]; r++) {
                String id = "c" + g + "r" + r;
                centreOf.put(id, "centre" + g);
                ids.add(id);
                groupOf.add(g);
            }
        }
        int n = ids.size();
        double[] bias = new double[n];
        for (int i = 0; i < n; i++) {
            bias[i] = i == sc.wideReader() ? 1.5 : -0.3 + 0.6 * random.nextDouble();
        }
        List<CaseDistances> distances = new ArrayList<>();
        List<ReaderCaseMeasure> raw = new ArrayList<>();
        List<ReaderCaseMeasure> common = new ArrayList<>();
        List<ReaderMeasure> variance = new ArrayList<>();
        List<CaseSummary> summaries = new ArrayList<>();
        for (int k = 0; k < 12; k++) {
            String caseId = String.format("k%02d", k);
            double radius = 7 + 3 * random.nextDouble();
            double[] r = new double[n];
            double[][] c = new double[n][3];
            for (int i = 0; i < n; i++) {
                r[i] = radius + sc.shift()[groupOf.get(i)] + bias[i] + 0.2 * random.nextGaussian();
                for (int a = 0; a < 3; a++) {
                    c[i][a] = 0.4 * random.nextGaussian();
                }
            }
            double[][] d = new double[n][n];
            for (int i = 0; i < n; i++) {
                for (int j = i + 1; j < n; j++) {
                    d[i][j] = jaccardDistance(r[i], r[j], c[i], c[j]);
                    d[j][i] = d[i][j];
                }
            }
            distances.add(new CaseDistances(caseId, ids, d));
            double mean = java.util.Arrays.stream(r).average().orElseThrow();
            for (int i = 0; i < n; i++) {
                double others = 0;
                int m = 0;
                for (int j = 0; j < n; j++) {
                    if (!groupOf.get(j).equals(groupOf.get(i))) {
                        others += r[j];
                        m++;
                    }
                }
                others = m == 0 ? Double.NaN : others / m;
                String centre = centreOf.get(ids.get(i));
                raw.add(new ReaderCaseMeasure(ids.get(i), centre, caseId, r[i] - others, Math.pow(r[i] / others, 3)));
                common.add(new ReaderCaseMeasure(ids.get(i), centre, caseId, r[i] - mean, Math.pow(r[i] / mean, 3)));
                variance.add(new ReaderMeasure(caseId, centre, ids.get(i), r[i] - mean));
            }
            summaries.add(new CaseSummary(caseId, 0.85, 3.0, 0, n));
        }
        return new LabelShiftInput(1, "lesion", "1 - Jaccard", centreOf, distances, raw, common, common,
                "signed surface distance against the consensus of all readers (mm)", sc.lrt() ? variance : List.of(),
                summaries, null);
    }

    /** The old variance measure: against the other centres' consensus (for the LRT comparison). */
    static List<ReaderMeasure> oldVarianceMeasure(LabelShiftInput in) {
        return in.centreMeasures().stream()
                .map(m -> new ReaderMeasure(m.caseId(), m.centre(), m.reader(), m.signedSurfaceMm())).toList();
    }

    static String rate(String what, int k, int n) {
        BinomialInterval b = BinomialInterval.of95(k, n);
        return String.format(Locale.ROOT, "  %-58s %4d / %4d = %.3f [%.3f, %.3f]", what, k, n, b.rate(), b.lower(),
                b.upper());
    }

    @Test
    void simulate() {
        int runs = Integer.getInteger("accordia.sim.runs", 0);
        assumeTrue(runs > 0, "simulation off (set -Daccordia.sim.runs)");
        String only = System.getProperty("accordia.sim.only", "");
        List<Scenario> scenarios = List.of(
                new Scenario("null 3x3", new int[] {3, 3, 3}, new double[] {0, 0, 0}, -1, true),
                new Scenario("+1.5 at centre1, 3x3", new int[] {3, 3, 3}, new double[] {0, 1.5, 0}, -1, false),
                new Scenario("-1.5 at centre1, 3x3", new int[] {3, 3, 3}, new double[] {0, -1.5, 0}, -1, false),
                new Scenario("+3.0 at centre1, 3x3", new int[] {3, 3, 3}, new double[] {0, 3.0, 0}, -1, false),
                new Scenario("+1.5 / -1.5 at centres 1 / 2, 3x3", new int[] {3, 3, 3}, new double[] {0, 1.5, -1.5}, -1,
                        false),
                new Scenario("one wide reader at centre0, 3x3", new int[] {3, 3, 3}, new double[] {0, 0, 0}, 0, false),
                new Scenario("null 4x3", new int[] {3, 3, 3, 3}, new double[] {0, 0, 0, 0}, -1, false),
                new Scenario("+1.5 at centre1, 4x3", new int[] {3, 3, 3, 3}, new double[] {0, 1.5, 0, 0}, -1, false),
                new Scenario("+1.5 at centres 1 and 3, 4x3", new int[] {3, 3, 3, 3}, new double[] {0, 1.5, 0, 1.5}, -1,
                        false),
                new Scenario("null 6x3", new int[] {3, 3, 3, 3, 3, 3}, new double[6], -1, false),
                new Scenario("+1.5 at centre1, 6x3", new int[] {3, 3, 3, 3, 3, 3}, new double[] {0, 1.5, 0, 0, 0, 0}, -1,
                        false),
                new Scenario("+1.5 at centre1, 2x3", new int[] {3, 3}, new double[] {0, 1.5}, -1, false),
                new Scenario("+1.5 at centre1, 2x5", new int[] {5, 5}, new double[] {0, 1.5}, -1, false),
                new Scenario("null, readers 1/3/3/2", new int[] {1, 3, 3, 2}, new double[4], -1, false),
                new Scenario("+1.5 at centre1, readers 1/3/3/2", new int[] {1, 3, 3, 2}, new double[] {0, 1.5, 0, 0}, -1,
                        false),
                new Scenario("+1.5 at the one-reader centre0, readers 1/3/3/2", new int[] {1, 3, 3, 2},
                        new double[] {1.5, 0, 0, 0}, -1, false));
        ShiftSettings s = ShiftSettings.defaults().withResampling(9_999, 200, 0, 199);
        for (Scenario sc : scenarios) {
            if (!only.isEmpty() && !sc.name().contains(only)) {
                continue;
            }
            int g = sc.readers().length;
            int anyInnocent = 0;
            int right = 0;
            int uncertain = 0;
            int anyFlag = 0;
            int lrtNew = 0;
            int lrtNewChi = 0;
            int lrtOld = 0;
            int covered = 0;
            int coverTrials = 0;
            int coveredAll = 0;
            int coverAllTrials = 0;
            double widthSum = 0;
            boolean shifted = java.util.Arrays.stream(sc.shift()).anyMatch(v -> v != 0);
            for (int run = 0; run < runs; run++) {
                Random random = new Random(20261202L * 31 + run * 1_000_003L + sc.name().hashCode());
                LabelShiftInput in = study(sc, random);
                LabelShiftReport rep = ShiftAnalysis.analyse(in, s);
                CentreFindings.Result f = rep.centreFindings();
                boolean innocentFlagged = false;
                boolean rightHere = true;
                double meanShift = 0;
                for (double v : sc.shift()) {
                    meanShift += v;
                }
                for (int c = 0; c < g; c++) {
                    CentreFindings.Finding fc = f.of("centre" + c);
                    double truth = sc.shift()[c] - (meanShift - sc.shift()[c]) / (g - 1);
                    GroupEffect e = rep.centreContrasts().get(c).effect();
                    if (Double.isFinite(e.signedSurfaceLoMm())) {
                        coverAllTrials++;
                        coveredAll += e.signedSurfaceLoMm() <= truth && truth <= e.signedSurfaceHiMm() ? 1 : 0;
                        if (sc.shift()[c] != 0) {
                            coverTrials++;
                            covered += e.signedSurfaceLoMm() <= truth && truth <= e.signedSurfaceHiMm() ? 1 : 0;
                            widthSum += e.signedSurfaceHiMm() - e.signedSurfaceLoMm();
                        }
                    }
                    boolean flagged = fc.kind().flagged();
                    if (sc.shift()[c] == 0 && flagged && !(g == 2)) {
                        innocentFlagged = true;
                    }
                    if (sc.shift()[c] != 0 && g > 2) {
                        rightHere &= flagged && Math.signum(fc.effect().signedSurfaceMm()) == Math.signum(sc.shift()[c]);
                    }
                }
                if (g == 2) {
                    rightHere = !f.flagged().isEmpty();
                }
                anyInnocent += innocentFlagged ? 1 : 0;
                anyFlag += f.flagged().isEmpty() ? 0 : 1;
                right += rightHere && shifted ? 1 : 0;
                uncertain += rep.summary().reasons().stream().anyMatch(x -> x.contains("uncertain")
                        || x.contains("evidence disagrees") || x.contains("does not move the same way")) ? 1 : 0;
                if (sc.lrt() && rep.varianceComponents() != null && rep.varianceComponents().centreTest() != null) {
                    lrtNew += rep.varianceComponents().centreTest().pValue() <= 0.05 ? 1 : 0;
                    VarianceComponents.Result chi = VarianceComponents.fit(in.varianceMeasures(), 0, 0, 5);
                    lrtNewChi += chi.centreTest().pValue() <= 0.05 ? 1 : 0;
                    VarianceComponents.Result old = VarianceComponents.fit(oldVarianceMeasure(in), 0, 199, 5 + run);
                    lrtOld += old.centreTest().pValue() <= 0.05 ? 1 : 0;
                }
            }
            System.out.println("scenario " + sc.name() + " (" + runs + " runs)");
            System.out.println(rate("any unshifted centre flagged", anyInnocent, runs));
            System.out.println(rate("any centre flagged", anyFlag, runs));
            if (shifted) {
                System.out.println(rate(g == 2 ? "pair flagged" : "every shifted centre flagged, right direction", right,
                        runs));
                System.out.println(rate("shifted centre's interval covers the truth", covered, coverTrials)
                        + String.format(Locale.ROOT, " (mean width %.2f mm)", widthSum / Math.max(1, coverTrials)));
            }
            System.out.println(rate("every centre's interval covers its truth", coveredAll, coverAllTrials));
            System.out.println(rate("uncertain-centre review", uncertain, runs));
            if (sc.lrt()) {
                System.out.println(rate("LRT sigma2_centre, common reference, bootstrap 199", lrtNew, runs));
                System.out.println(rate("LRT sigma2_centre, common reference, chi2 mixture", lrtNewChi, runs));
                System.out.println(rate("LRT sigma2_centre, other centres' consensus, bootstrap", lrtOld, runs));
            }
        }
    }
}
