package org.accordia.shift;


/**
 * One row of {@code centres.csv}: a centre's effect against the other centres' consensus for one
 * label. Distances in mm; volume ratio unitless (geometric mean); intervals are 95 % case-bootstrap
 * percentile intervals. {@code flag} is {@code shift}, {@code differ} (both centres of a
 * two-centre study that differ from each other), {@code uncertain} or {@code none} (see
 * {@link VerdictRules}); with three or more centres the flag comes from the median-centred offsets,
 * not from these raw columns.
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
        double outsideShare,
        double outsideExcess,
        double outsideExcessLo,
        double outsideExcessHi,
        double insideShare,
        double insideExcess,
        double insideExcessLo,
        double insideExcessHi) {

    /** A row without local (border-beyond-tolerance) columns. */
    public CentreRow(String label, String centre, int readers, int cases, double signedSurfaceMm,
            double signedSurfaceLoMm, double signedSurfaceHiMm, double volumeRatio, double volumeRatioLo,
            double volumeRatioHi, String flag) {
        this(label, centre, readers, cases, signedSurfaceMm, signedSurfaceLoMm, signedSurfaceHiMm, volumeRatio,
                volumeRatioLo, volumeRatioHi, flag, Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN,
                Double.NaN, Double.NaN, Double.NaN);
    }

    static CentreRow of(String label, GroupEffect e, String flag) {
        return of(label, e, flag, null);
    }

    static CentreRow of(String label, GroupEffect e, String flag, LocalEffect l) {
        double n = Double.NaN;
        return new CentreRow(label, e.group(), e.readers(), e.cases(), e.signedSurfaceMm(), e.signedSurfaceLoMm(),
                e.signedSurfaceHiMm(), e.volumeRatio(), e.volumeRatioLo(), e.volumeRatioHi(), flag,
                l == null ? n : l.outsideShare(), l == null ? n : l.outsideExcess(),
                l == null ? n : l.outsideExcessLo(), l == null ? n : l.outsideExcessHi(),
                l == null ? n : l.insideShare(), l == null ? n : l.insideExcess(),
                l == null ? n : l.insideExcessLo(), l == null ? n : l.insideExcessHi());
    }
}
