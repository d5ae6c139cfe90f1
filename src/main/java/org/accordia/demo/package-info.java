/**
 * The synthetic study generator (the bundled demo-masks/, tests, benchmarks, calibration): a
 * fictional multi-centre study with planted effects whose truth is written beside it.
 *
 * <p>Public API: {@code DemoGenerator}, {@code DemoSpec}, {@code DemoTruth}. Depends on io and study.
 */
package org.accordia.demo;
