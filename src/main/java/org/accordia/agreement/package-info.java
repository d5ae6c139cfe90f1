/**
 * Pairwise agreement of one case: one pass over the masks builds the decision-pattern histogram
 * ({@link org.accordia.agreement.PatternHistogram}) from which every pairwise overlap and Fleiss'
 * kappa follow; an exact distance transform on the cropped region gives the surface metrics
 * ({@link org.accordia.agreement.SurfaceMetrics}) in the HD95 variant the settings name.
 *
 * <p>Public API: {@code CaseAgreementEngine}, {@code CaseAgreement}, {@code PairMetrics},
 * {@code SurfaceMetrics}, {@code PatternHistogram}, {@code DistanceTransform}, {@code Borders},
 * {@code Kappa}. Depends on io, study, grid and stats.
 */
package org.accordia.agreement;
