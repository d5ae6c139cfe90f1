/**
 * Writing a result: the CSV tables ({@link org.accordia.report.Tables}), summary.json
 * ({@link org.accordia.report.SummaryJson}), the HTML report ({@link org.accordia.report.AnalysisReport})
 * with its charts and pictures, the consensus files written while each case is in memory
 * ({@link org.accordia.report.ConsensusFiles}, a {@code CaseSink}) and the atomic output folder
 * ({@link org.accordia.report.OutputFolder}). The report reads only the result and its settings.
 *
 * <p>Public API: {@code AnalysisReport}, {@code Tables}, {@code SummaryJson}, {@code ConsensusFiles},
 * {@code OutputFolder}, {@code CsvTable}, {@code JsonOutput}. {@code HtmlReport}, {@code Charts},
 * {@code Overlays}, {@code Png}, {@code Palette} and the other helpers are implementation.
 * Depends on analysis and everything above it.
 */
package org.accordia.report;
