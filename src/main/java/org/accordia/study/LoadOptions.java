package org.accordia.study;

/**
 * How a study is discovered.
 *
 * @param allowPathEscape accept mask or image paths that lead outside the study root (after
 *     normalisation and after resolving symbolic links); refused by default
 */
public record LoadOptions(boolean allowPathEscape) {
    public static final LoadOptions DEFAULT = new LoadOptions(false);
}
