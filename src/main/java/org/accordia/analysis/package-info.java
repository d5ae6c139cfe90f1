/**
 * The analysis pipeline: from a source of cases (a study folder, or cases generated in memory) to
 * the study's result, one immutable {@link org.accordia.analysis.StudyResult}.
 *
 * <p>Flow: per case, in parallel over a bounded pool (at most {@code threads} cases in memory at
 * once), the masks are loaded, agreement is measured per structure, the STAPLE references (all
 * readers, leave-one-reader-out, leave-one-centre-out, with signed surfaces) are estimated, a
 * {@link org.accordia.analysis.CaseSink} may write the case's consensus outputs while the volumes
 * are in memory, and a small voxel-free {@link org.accordia.analysis.CaseRecord} is kept. At the
 * study level, per structure, the shift analysis and reader summaries run on the records only.
 *
 * <p>Depends on study, io, agreement, consensus and shift; the report package depends on this one.
 */
package org.accordia.analysis;
