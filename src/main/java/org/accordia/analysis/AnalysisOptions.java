package org.accordia.analysis;

import org.accordia.shift.ShiftSettings;

/**
 * How a run is carried out (what is computed comes from the protocol).
 *
 * @param threads cases analysed in parallel, and the most cases in memory at once (at least 1);
 *     results do not depend on it
 * @param shiftSettings the shift analysis settings, or {@code null} to derive them from the
 *     protocol ({@link StudyAnalysis#shiftSettings}); a simulation may pass fewer resamples here
 * @param readerSummaries whether to compute the per-reader bootstrap summaries (the costliest
 *     study-level step after the shift test; a calibration run may skip them)
 */
public record AnalysisOptions(int threads, ShiftSettings shiftSettings, boolean readerSummaries) {
    public AnalysisOptions {
        if (threads < 1) {
            throw new IllegalArgumentException("threads must be at least 1");
        }
    }

    /** Every core, settings from the protocol, reader summaries on. */
    public static AnalysisOptions defaults() {
        return new AnalysisOptions(Math.max(1, Runtime.getRuntime().availableProcessors()), null, true);
    }

    public AnalysisOptions withThreads(int n) {
        return new AnalysisOptions(n, shiftSettings, readerSummaries);
    }

    public AnalysisOptions withShiftSettings(ShiftSettings s) {
        return new AnalysisOptions(threads, s, readerSummaries);
    }

    public AnalysisOptions withReaderSummaries(boolean on) {
        return new AnalysisOptions(threads, shiftSettings, on);
    }
}
