package org.accordia.shift;


/**
 * One row of {@code centres.csv} for one label and centre.
 *
 * <p>Columns 5–10 (kept for compatibility): the centre's readers against the consensus of the OTHER
 * centres, with 95 % case-bootstrap percentile intervals (readers fixed). These raw numbers carry
 * the mirror of another centre's shift and are not what the flag judges.
 *
 * <p>Appended columns: the estimand the flag judges, Δ_c = μ_c − mean_{d≠c} μ_d with μ_c the
 * population mean (over the centre's readers, as random, and cases) signed surface distance in mm
 * (positive = outside) of a reader's border from one common reference surface per case (the
 * consensus of all readers), its 95 % model-based interval (readers and cases random,
 * {@link CentreContrasts}), the same contrast of the log volume ratio as a ratio, and the centre's
 * own centre-vs-rest permutation test with its Holm-adjusted p-value ({@link CentreVsRest}).
 * {@code finding} is the {@link CentreFindings.Kind#key()} behind {@code flag}.
 */
public record CentreRow(
        String label,
        String centre,
        int readers,
        int cases,
        double signedSurfaceMm,
        double signedSurfaceLoMm,
        double signedSurfaceHiMm,
        double volumeRatio,
        double volumeRatioLo,
        double volumeRatioHi,
        String flag,
        double effectMm,
        double effectLoMm,
        double effectHiMm,
        double effectVolumeRatio,
        double effectVolumeRatioLo,
        double effectVolumeRatioHi,
        double testP,
        double testPAdjusted,
        double testMinP,
        long testPermutations,
        String finding,
        double outsideShare,
        double outsideExcess,
        double outsideExcessLo,
        double outsideExcessHi,
        double insideShare,
        double insideExcess,
        double insideExcessLo,
        double insideExcessHi) {

    /** A row without the local (border-beyond-tolerance) columns. */
    public CentreRow(String label, String centre, int readers, int cases, double signedSurfaceMm,
            double signedSurfaceLoMm, double signedSurfaceHiMm, double volumeRatio, double volumeRatioLo,
            double volumeRatioHi, String flag, double effectMm, double effectLoMm, double effectHiMm,
            double effectVolumeRatio, double effectVolumeRatioLo, double effectVolumeRatioHi, double testP,
            double testPAdjusted, double testMinP, long testPermutations, String finding) {
        this(label, centre, readers, cases, signedSurfaceMm, signedSurfaceLoMm, signedSurfaceHiMm, volumeRatio,
                volumeRatioLo, volumeRatioHi, flag, effectMm, effectLoMm, effectHiMm, effectVolumeRatio,
                effectVolumeRatioLo, effectVolumeRatioHi, testP, testPAdjusted, testMinP, testPermutations, finding,
                Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN);
    }

    static CentreRow of(String label, GroupEffect raw, CentreFindings.Finding f, GroupEffect delta) {
        return of(label, raw, f, delta, null);
    }

    static CentreRow of(String label, GroupEffect raw, CentreFindings.Finding f, GroupEffect delta, LocalEffect l) {
        CentreVsRest.Result t = f == null ? null : f.test();
        double nan = Double.NaN;
        return new CentreRow(label, raw.group(), raw.readers(), raw.cases(), raw.signedSurfaceMm(),
                raw.signedSurfaceLoMm(), raw.signedSurfaceHiMm(), raw.volumeRatio(), raw.volumeRatioLo(),
                raw.volumeRatioHi(), f == null ? VerdictRules.FLAG_NONE : f.kind().flag(),
                delta == null ? nan : delta.signedSurfaceMm(), delta == null ? nan : delta.signedSurfaceLoMm(),
                delta == null ? nan : delta.signedSurfaceHiMm(), delta == null ? nan : delta.volumeRatio(),
                delta == null ? nan : delta.volumeRatioLo(), delta == null ? nan : delta.volumeRatioHi(),
                t == null ? nan : t.pValue(), t == null ? nan : t.adjustedP(), t == null ? nan : t.minP(),
                t == null ? 0 : t.permutations(),
                f == null ? CentreFindings.Kind.NONE.key() : f.kind().key(),
                l == null ? nan : l.outsideShare(), l == null ? nan : l.outsideExcess(),
                l == null ? nan : l.outsideExcessLo(), l == null ? nan : l.outsideExcessHi(),
                l == null ? nan : l.insideShare(), l == null ? nan : l.insideExcess(),
                l == null ? nan : l.insideExcessLo(), l == null ? nan : l.insideExcessHi());
    }
}
