package org.accordia.shift;


/**
 * One row of {@code centres.csv}: a centre's effect against the other centres' consensus for one
 * label. Distances in mm; volume ratio unitless (geometric mean); intervals are 95 % case-bootstrap
 * percentile intervals. {@code flag} is {@code shift}, {@code uncertain} or {@code none}
 * (see {@link VerdictRules}).
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
        String flag) {

    static CentreRow of(String label, GroupEffect e, String flag) {
        return new CentreRow(label, e.group(), e.readers(), e.cases(), e.signedSurfaceMm(), e.signedSurfaceLoMm(),
                e.signedSurfaceHiMm(), e.volumeRatio(), e.volumeRatioLo(), e.volumeRatioHi(), flag);
    }
}
