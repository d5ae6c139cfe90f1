package org.accordia.shift;

import java.util.List;

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

    public static final List<String> CSV_HEADER = List.of("label", "centre", "readers", "cases", "signed_surface_mm",
            "signed_surface_lo", "signed_surface_hi", "volume_ratio", "volume_ratio_lo", "volume_ratio_hi", "flag");

    static CentreRow of(String label, GroupEffect e, String flag) {
        return new CentreRow(label, e.group(), e.readers(), e.cases(), e.signedSurfaceMm(), e.signedSurfaceLoMm(),
                e.signedSurfaceHiMm(), e.volumeRatio(), e.volumeRatioLo(), e.volumeRatioHi(), flag);
    }

    /** The row as cells in {@link #CSV_HEADER} order: Locale.ROOT, up to 6 significant digits, NaN as "". */
    public List<String> cells() {
        return List.of(label, centre, Integer.toString(readers), Integer.toString(cases), Numbers.cell(signedSurfaceMm),
                Numbers.cell(signedSurfaceLoMm), Numbers.cell(signedSurfaceHiMm), Numbers.cell(volumeRatio),
                Numbers.cell(volumeRatioLo), Numbers.cell(volumeRatioHi), flag);
    }
}
