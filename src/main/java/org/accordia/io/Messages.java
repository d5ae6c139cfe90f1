package org.accordia.io;

/**
 * The one place where text that may come from input (file names, header fields, manifest cells,
 * exception messages) is made safe to print as one line of an error or a report: line breaks and
 * tabs become spaces, every other control character (C0, DEL, C1) and the Unicode characters
 * that reorder or break terminal text (line and paragraph separators, bidirectional overrides
 * and isolates) become a visible {@code \}{@code uXXXX}, and the result is cut after
 * {@value #MAX_CHARS} characters with a note of how much was left out. Used by
 * {@link InputException}, the study problems and the command line's error printing.
 */
public final class Messages {
    /** The most characters of one message printed. */
    public static final int MAX_CHARS = 1000;

    private Messages() {
    }

    /** {@code text} as one safe line of at most {@link #MAX_CHARS} characters (plus the cut note). */
    public static String oneLine(String text) {
        if (text == null) {
            return "";
        }
        StringBuilder b = new StringBuilder(Math.min(text.length(), MAX_CHARS) + 16);
        int i = 0;
        while (i < text.length() && b.length() < MAX_CHARS) {
            char c = text.charAt(i++);
            if (c == '\n' || c == '\r' || c == '\t') {
                b.append(' ');
            } else if (c < 0x20 || (c >= 0x7F && c <= 0x9F) || c == '\u2028' || c == '\u2029'
                    || (c >= '\u202A' && c <= '\u202E') || (c >= '\u2066' && c <= '\u2069') || c == '\uFEFF') {
                b.append(String.format(java.util.Locale.ROOT, "\\u%04x", (int) c));
            } else {
                b.append(c);
            }
        }
        if (i < text.length()) {
            b.append("... (").append(text.length() - i).append(" more characters)");
        }
        return b.toString();
    }

    /** {@code text} cut after {@code max} characters ("..." marks the cut): for quoting a field in a message. */
    public static String clip(String text, int max) {
        return text == null || text.length() <= max ? text : text.substring(0, max) + "...";
    }
}
