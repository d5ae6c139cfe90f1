/**
 * Library-level performance harnesses and the calibration simulation. Nothing here is used by an
 * analysis; the {@code accordia bench} and {@code accordia calibrate} commands print what these
 * classes measure. Every timing ratio is measured in one JVM run against the time the same JVM
 * needs to read and inflate the inputs (medians over rounds after a warm-up); unit tests never
 * assert on wall time. See docs/benchmarks.md and docs/calibration.md.
 *
 * <p>Not library API: tooling (child JVMs, probes, performance targets) that should move out of
 * the runnable jar's core in a later change.
 */
package org.accordia.bench;
