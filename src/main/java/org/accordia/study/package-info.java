/**
 * What a study is: centres, readers, cases and their masks, discovered from a folder layout or a
 * manifest ({@link org.accordia.study.StudyLoader}); the protocol file
 * ({@link org.accordia.study.Protocol}, {@link org.accordia.study.ProtocolLoader}, with the one
 * set of defaults); loading one case with its geometry check ({@link org.accordia.study.CaseLoader});
 * inspecting a whole study ({@link org.accordia.study.Inspector}) and the one analysability rule
 * ({@link org.accordia.study.Analysability}).
 *
 * <p>Public API: {@code Study}, {@code StudyLoader}, {@code LoadOptions}, {@code Protocol},
 * {@code ProtocolLoader}, {@code Structure}, {@code ReaderId}, {@code MaskRef}, {@code CaseReader},
 * {@code LoadedCase}, {@code CaseLoader}, {@code Inspector}, {@code InspectionReport},
 * {@code StudyProblem}, {@code Analysability}. Depends on io only.
 */
package org.accordia.study;
