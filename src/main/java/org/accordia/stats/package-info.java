/**
 * Shared statistics vocabulary: the one type-7 sample quantile (Hyndman &amp; Fan 1996) and the
 * one median of the project ({@link org.accordia.stats.Quantiles}). Public API. Depends on nothing
 * else of the project.
 */
package org.accordia.stats;
