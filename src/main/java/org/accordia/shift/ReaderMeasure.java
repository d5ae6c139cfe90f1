package org.accordia.shift;

/**
 * One per-reader, per-case measurement for the variance-component model (for example the signed
 * surface distance against the other centres' consensus in mm, the log volume, or a sensitivity).
 * NaN values are left out of the fit.
 */
public record ReaderMeasure(String caseId, String centre, String reader, double value) {
    public ReaderMeasure {
        if (caseId == null || centre == null || reader == null) {
            throw new IllegalArgumentException("case id, centre and reader are required");
        }
    }
}
