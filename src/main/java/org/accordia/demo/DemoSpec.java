package org.accordia.demo;

import org.accordia.io.ReadLimits;

/**
 * What the demo generator plants (docs/demo.md describes the scenario).
 *
 * @param seed seed of every random choice; same seed, same bytes
 * @param cases number of cases (1..999)
 * @param centres number of centres (1..26)
 * @param readersPerCentre readers at each centre (1..26)
 * @param nx grid size along x (at least 8)
 * @param ny grid size along y (at least 8)
 * @param nz grid size along z (at least 4)
 * @param sxMm voxel spacing along x in mm
 * @param syMm voxel spacing along y in mm
 * @param szMm voxel spacing along z in mm
 * @param centreShiftMm margin shift of the shifted centre's readers in mm (0 = no shifted centre)
 * @param missedLesionCases number of cases in which one reader misses the small second lesion
 * @param hardCases number of cases with large reader disagreement
 * @param readerBiasMm spread of the readers' personal margin bias (uniform in +-this), mm
 * @param noiseAmplitudeMm standard deviation of the smooth boundary noise in ordinary cases, mm
 */
public record DemoSpec(long seed, int cases, int centres, int readersPerCentre, int nx, int ny, int nz,
                       double sxMm, double syMm, double szMm, double centreShiftMm, int missedLesionCases,
                       int hardCases, double readerBiasMm, double noiseAmplitudeMm) {

    public static final long DEFAULT_SEED = 20261202L;

    public DemoSpec {
        check(cases >= 1 && cases <= 999, "cases must lie in 1..999");
        check(centres >= 1 && centres <= 26, "centres must lie in 1..26");
        check(readersPerCentre >= 1 && readersPerCentre <= 26, "readers per centre must lie in 1..26");
        check(nx >= 8 && ny >= 8 && nz >= 4, "size must be at least 8x8x4");
        check((long) nx * ny * nz <= ReadLimits.ARRAY_LIMIT, "size exceeds the largest volume a Java array holds");
        check(sxMm > 0 && syMm > 0 && szMm > 0 && Double.isFinite(sxMm + syMm + szMm), "spacing must be positive");
        check(Double.isFinite(centreShiftMm) && Math.abs(centreShiftMm) <= 10, "centre shift must lie in [-10, 10] mm");
        check(missedLesionCases >= 0 && hardCases >= 0, "counts must not be negative");
        check(hardCases + missedLesionCases <= cases, "hard cases plus missed-lesion cases exceed the number of cases");
        check(readerBiasMm >= 0 && readerBiasMm <= 5, "reader bias must lie in [0, 5] mm");
        check(noiseAmplitudeMm >= 0 && noiseAmplitudeMm <= 5, "noise amplitude must lie in [0, 5] mm");
    }

    private static void check(boolean ok, String message) {
        if (!ok) {
            throw new IllegalArgumentException(message);
        }
    }

    /** The committed demo study: 10 cases, 3 centres x 3 readers, 96x96x48 at 0.8x0.8x2.5 mm. */
    public static DemoSpec defaults() {
        return new DemoSpec(DEFAULT_SEED, 10, 3, 3, 96, 96, 48, 0.8, 0.8, 2.5, 1.5, 3, 2, 0.3, 0.5);
    }

    public DemoSpec withSeed(long s) {
        return new DemoSpec(s, cases, centres, readersPerCentre, nx, ny, nz, sxMm, syMm, szMm, centreShiftMm,
            missedLesionCases, hardCases, readerBiasMm, noiseAmplitudeMm);
    }

    public DemoSpec withRoster(int nCases, int nCentres, int nReadersPerCentre) {
        return new DemoSpec(seed, nCases, nCentres, nReadersPerCentre, nx, ny, nz, sxMm, syMm, szMm, centreShiftMm,
            Math.min(missedLesionCases, Math.max(0, nCases - Math.min(hardCases, nCases))), Math.min(hardCases, nCases),
            readerBiasMm, noiseAmplitudeMm);
    }

    public DemoSpec withGrid(int x, int y, int z, double sx, double sy, double sz) {
        return new DemoSpec(seed, cases, centres, readersPerCentre, x, y, z, sx, sy, sz, centreShiftMm,
            missedLesionCases, hardCases, readerBiasMm, noiseAmplitudeMm);
    }

    public DemoSpec withPlants(double shiftMm, int missed, int hard) {
        return new DemoSpec(seed, cases, centres, readersPerCentre, nx, ny, nz, sxMm, syMm, szMm, shiftMm,
            missed, hard, readerBiasMm, noiseAmplitudeMm);
    }
}
