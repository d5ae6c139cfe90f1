/**
 * The study level of one structure: the within- and between-centre partition of reader
 * distances with its reader-permutation test, REML variance components, ICC, centre and reader
 * effects with intervals, the review lists and the verdict with the rule that fired.
 *
 * <p>Public API: {@code ShiftAnalysis}, {@code ShiftSettings}, {@code LabelShiftInput},
 * {@code LabelShiftReport}, {@code LabelShiftSummary}, {@code Verdict}, {@code VerdictRules} and
 * the result records. Depends on study (default settings) and stats.
 */
package org.accordia.shift;
