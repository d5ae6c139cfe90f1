/**
 * The one entry point of a run over a study on disk: {@link org.accordia.run.RunRequest} →
 * {@link org.accordia.run.StudyRun#prepare} (study discovered, protocol resolved once: the file
 * given, else the study's {@code protocol.yaml}, else the defaults, recorded as a
 * {@link org.accordia.run.ProtocolSource}) → {@link org.accordia.run.PreparedStudy} →
 * {@link org.accordia.run.StudyRun#inspect} or {@link org.accordia.run.StudyRun#analyze}
 * (the analysability rule, input checksums, the output folder, the analysis, the report, and
 * discard-on-failure). {@code inspect}, {@code analyze} and the end-to-end benchmark call it.
 *
 * <p>Public API: every class here. Depends on study, analysis and report; only cli and bench
 * depend on it.
 */
package org.accordia.run;
