/**
 * Consensus estimates and each reader's performance against them: binary and multi-label STAPLE,
 * majority vote, the leave-one-reader-out and leave-one-centre-out references of a case
 * ({@link org.accordia.consensus.CaseReferences}), signed surface distances, the majority
 * components a reader leaves out ({@link org.accordia.consensus.MissedComponents}), per-reader
 * bootstrap summaries, and the consensus volumes.
 *
 * <p>Public API: {@code BinaryStaple}, {@code MultiLabelStaple}, {@code StapleOptions},
 * {@code StapleResult}, {@code MultiLabelStapleResult}, {@code MajorityVote},
 * {@code CaseReferences}, {@code ReaderPerformance}, {@code ReaderSummary},
 * {@code MissedComponents}, {@code ConsensusOutputs}. The histogram and tie-rule helpers are
 * implementation. Depends on io, study, grid, stats and agreement.
 */
package org.accordia.consensus;
