/**
 * The analysis pipeline: from a source of cases (a study folder, or cases generated in memory) to
 * the study's result, one immutable {@link org.accordia.analysis.StudyResult}.
 *
 * <p>Flow: {@link org.accordia.analysis.StudyAnalysis#plan} computes the
 * {@link org.accordia.analysis.CasePlan} once (structures, multi-label consensus, every step's
 * {@link org.accordia.analysis.AnalysisSettings}); a {@link org.accordia.analysis.CaseExecutor}
 * (today the bounded local pool: at most {@code threads} cases in memory) runs the per-case unit
 * {@link org.accordia.analysis.CaseAnalysis#analyse} on each case (agreement per structure, the
 * STAPLE references with signed surfaces, missed components, the multi-label consensus), a
 * {@link org.accordia.analysis.CaseSink} may write the case's consensus outputs and crop its
 * pictures while the volumes are in memory, and a small voxel-free
 * {@link org.accordia.analysis.CaseRecord} is kept; {@link org.accordia.analysis.StudyAnalysis#studyLevel}
 * then runs the shift analysis and reader summaries per structure on the records only.
 *
 * <p>Public API: {@code StudyAnalysis}, {@code CaseAnalysis}, {@code CasePlan},
 * {@code CaseExecutor}, {@code CaseSource}, {@code CaseSink}, {@code AnalysisOptions},
 * {@code AnalysisSettings}, {@code InputChecksums} and the result records ({@code StudyResult},
 * {@code CaseRecord}, {@code StructureCase}, {@code LabelResult}, {@code FlaggedEvent},
 * {@code MissedStructure}). Internal: {@code Failures}.
 *
 * <p>Depends on study, io, grid, stats, agreement, consensus and shift; report and run depend on
 * this one.
 */
package org.accordia.analysis;
