package org.accordia.report;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Base64;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Objects;
import org.apache.commons.text.StringEscapeUtils;

/**
 * Builds the HTML report: one self-contained HTML5 file with no external resource of any kind (no
 * links, scripts, fonts or style sheets from elsewhere; pictures embedded as
 * {@code data:image/png;base64,...}), so it opens offline, can be mailed as one file, and prints
 * cleanly (A4 or Letter, black text, page breaks kept out of figures, tables rows and callouts).
 *
 * <p>Every text passed to the builder is plain text and is escaped
 * ({@link #escape(String)}: Apache Commons Text {@code escapeHtml4} plus the apostrophe, with
 * control characters replaced), so a reader called {@code <script>alert(1)</script>} shows as
 * those characters. As a second line of defence the page carries a Content-Security-Policy that
 * allows no script, no connection and images only from {@code data:}.
 *
 * <p>Decisions are shown by {@link #callout(Level, String, String)}: each level has its own text
 * badge, symbol, border style and colour (from the Okabe–Ito colour-blind-safe set), so colour is
 * never the only cue, and the badge survives black-and-white printing.
 *
 * <p>The builder is not thread-safe; build one report on one thread.
 */
public final class HtmlReport {

    /** The decision levels, least to most severe, with their badge text. */
    public enum Level {
        /** The centres' annotations agree well enough to be pooled. */
        POOL("POOL", "\u2713", "pool"),
        /** Differences need a person's review before pooling. */
        REVIEW("REVIEW", "!", "review"),
        /** The annotations should be redone (or harmonised) before use. */
        REANNOTATE("RE-ANNOTATE", "\u2716", "reannotate");

        private final String badge;
        private final String symbol;
        private final String cssClass;

        Level(String badge, String symbol, String cssClass) {
            this.badge = badge;
            this.symbol = symbol;
            this.cssClass = cssClass;
        }

        /** The text on the badge, e.g. {@code RE-ANNOTATE}. */
        public String badge() {
            return badge;
        }
    }

    private static final String STYLE = """
        :root{--ink:#1f2430;--muted:#5b6270;--paper:#fbfaf7;--rule:#d9d5cc;--band:#f1eee7;--accent:#3b5b7a;
        --pool:#0072b2;--pool-bg:#e8f1f8;--review:#b86e00;--review-bg:#fbf1de;--re:#a33b00;--re-bg:#f8e6dc}
        *{box-sizing:border-box}
        html{background:var(--paper);color:var(--ink)}
        body{margin:0 auto;max-width:60rem;padding:2rem 1.5rem 3rem;
        font:16px/1.55 system-ui,-apple-system,"Segoe UI",Roboto,"Noto Sans","Liberation Sans",Arial,sans-serif}
        h1,h2,h3{font-family:Charter,"Bitstream Charter","Sitka Text",Cambria,"Noto Serif","DejaVu Serif",Georgia,serif;
        line-height:1.25;font-weight:600}
        h1{font-size:1.9rem;margin:0 0 .3rem}
        h2{font-size:1.4rem;margin:2.4rem 0 .8rem;padding-bottom:.25rem;border-bottom:2px solid var(--accent)}
        h3{font-size:1.12rem;margin:1.6rem 0 .5rem}
        .subtitle{color:var(--muted);margin:0 0 1.5rem}
        nav.contents{background:var(--band);border:1px solid var(--rule);padding:.4rem .8rem;margin:.6rem 0 1rem;
        font-size:.9rem}
        nav.contents ol{display:inline;margin:0;padding:0;list-style:none}
        nav.contents li{display:inline}
        nav.contents li+li::before{content:" \u00b7 ";color:var(--muted)}
        nav.contents a{color:var(--accent)}
        p{margin:.6rem 0}
        .table-wrap{overflow-x:auto;margin:.8rem 0 1.2rem;max-width:100%}
        table{border-collapse:collapse;font-size:.92rem;min-width:50%}
        .mono{font:.8rem/1.4 ui-monospace,"Cascadia Mono","DejaVu Sans Mono",Menlo,Consolas,monospace;white-space:nowrap}
        details{margin:.8rem 0;border:1px solid var(--rule);background:#fff;padding:.2rem .9rem}
        details>summary{cursor:pointer;font-weight:600;color:var(--accent);padding:.4rem 0}
        details[open]>summary{border-bottom:1px solid var(--rule);margin-bottom:.4rem}
        caption{text-align:left;font-weight:600;padding:.2rem 0 .4rem;color:var(--muted)}
        th,td{padding:.3rem .65rem;border-bottom:1px solid var(--rule);text-align:left;vertical-align:top}
        thead th{border-bottom:2px solid var(--ink);background:var(--band)}
        tbody tr:nth-child(even){background:#f6f4ef}
        .num{text-align:right;font-variant-numeric:tabular-nums;white-space:nowrap}
        figure{margin:1.2rem 0;text-align:center}
        figure img{max-width:100%;height:auto;border:1px solid var(--rule);background:#fff}
        figcaption{font-size:.9rem;color:var(--muted);margin-top:.4rem;text-align:left}
        pre{background:var(--band);border:1px solid var(--rule);padding:.7rem .9rem;overflow-x:auto;
        font:.86rem/1.45 ui-monospace,"Cascadia Mono","DejaVu Sans Mono",Menlo,Consolas,monospace;white-space:pre-wrap}
        dl{display:grid;grid-template-columns:max-content 1fr;gap:.25rem 1.2rem;margin:.8rem 0}
        dt{font-weight:600}
        dd{margin:0;overflow-wrap:anywhere}
        @media (max-width:640px){
        body{padding:1rem .8rem 2rem;font-size:15px}
        h1{font-size:1.5rem}
        dl{grid-template-columns:1fr}
        dd{margin:0 0 .4rem}
        }
        .callout{margin:1rem 0;padding:.7rem 1rem .8rem;border-left-width:.5rem;border-left-style:solid}
        .callout .head{display:flex;gap:.7rem;align-items:baseline;flex-wrap:wrap}
        .callout .title{font-weight:600}
        .badge{display:inline-block;font-weight:700;font-size:.8rem;letter-spacing:.06em;padding:.1rem .5rem;
        border:2px solid currentColor;border-radius:.2rem;background:#fff}
        .callout.pool{background:var(--pool-bg);border-left-color:var(--pool);border-left-style:solid}
        .callout.pool .badge{color:var(--pool)}
        .callout.review{background:var(--review-bg);border-left-color:var(--review);border-left-style:dashed}
        .callout.review .badge{color:var(--review);border-style:dashed}
        .callout.reannotate{background:var(--re-bg);border-left-color:var(--re);border-left-style:double;border-left-width:.75rem}
        .callout.reannotate .badge{color:#fff;background:var(--re);border-color:var(--re)}
        footer{margin-top:3rem;padding-top:.8rem;border-top:2px solid var(--ink);font-size:.9rem}
        footer h2{font-size:1.1rem;border:0;margin:.2rem 0 .4rem;padding:0}
        footer ul{margin:.2rem 0 .6rem 1.2rem;padding:0}
        footer .generated{color:var(--muted)}
        @media print{
        html{background:#fff}
        body{max-width:none;padding:0;font-size:10.5pt}
        nav.contents{display:none}
        .table-wrap{overflow:visible}
        details{border:0;padding:0}
        details::details-content{content-visibility:visible;display:block}
        h2,h3{break-after:avoid;page-break-after:avoid}
        figure,.callout,tr,pre,dl{break-inside:avoid;page-break-inside:avoid}
        .callout,thead th,tbody tr:nth-child(even),pre{-webkit-print-color-adjust:exact;print-color-adjust:exact}
        a{color:inherit;text-decoration:none}
        }
        @page{margin:16mm 14mm}
        """;

    private static final String CSP = "default-src 'none'; img-src data:; style-src 'unsafe-inline'; "
        + "script-src 'none'; connect-src 'none'; form-action 'none'; base-uri 'none'";

    private final String title;
    private String subtitle;
    private final StringBuilder body = new StringBuilder();
    private final List<String> sectionTitles = new ArrayList<>();
    private final List<String> cautions = new ArrayList<>();
    private String generatedBy;
    private boolean closeSectionPending;
    private int openDetails;

    /** A report with this title (page title and main heading). */
    public HtmlReport(String title) {
        this.title = Objects.requireNonNull(title, "title");
    }

    /**
     * Escapes a plain text for HTML element content and double- or single-quoted attribute values:
     * Apache Commons Text {@code StringEscapeUtils.escapeHtml4} (which escapes {@code & < > "} and
     * non-ASCII characters with named entities where HTML 4 has them), plus {@code '} as
     * {@code &#39;}; control characters other than tab, LF and CR (not allowed in HTML) become
     * U+FFFD. {@code null} becomes the empty string.
     */
    public static String escape(String text) {
        if (text == null) {
            return "";
        }
        StringBuilder clean = null;
        for (int i = 0; i < text.length(); i++) {
            char c = text.charAt(i);
            boolean bad = (c < 0x20 && c != '\t' && c != '\n' && c != '\r') || (c >= 0x7f && c <= 0x9f);
            if (bad) {
                if (clean == null) {
                    clean = new StringBuilder(text.substring(0, i));
                }
                clean.append('\uFFFD');
            } else if (clean != null) {
                clean.append(c);
            }
        }
        String s = clean == null ? text : clean.toString();
        return StringEscapeUtils.escapeHtml4(s).replace("'", "&#39;");
    }

    /** A line under the main heading (e.g. the study name and date). */
    public HtmlReport subtitle(String text) {
        this.subtitle = text;
        return this;
    }

    /** The "generated by" line of the footer (e.g. tool name and version); optional. */
    public HtmlReport generatedBy(String text) {
        this.generatedBy = text;
        return this;
    }

    /** Starts a section (a second-level heading, listed in the contents at the top). */
    public HtmlReport section(String sectionTitle) {
        while (openDetails > 0) {
            endDetails();
        }
        closeSection();
        sectionTitles.add(sectionTitle);
        body.append("<section id=\"s").append(sectionTitles.size()).append("\">\n<h2>")
            .append(escape(sectionTitle)).append("</h2>\n");
        closeSectionPending = true;
        return this;
    }

    private void closeSection() {
        if (closeSectionPending) {
            body.append("</section>\n");
            closeSectionPending = false;
        }
    }

    /** A third-level heading inside the current section. */
    public HtmlReport subsection(String subsectionTitle) {
        body.append("<h3>").append(escape(subsectionTitle)).append("</h3>\n");
        return this;
    }

    /** A paragraph of plain text. */
    public HtmlReport paragraph(String text) {
        body.append("<p>").append(escape(text)).append("</p>\n");
        return this;
    }

    /**
     * A decision box: the level's badge (text, symbol, border style and colour), a title such as the
     * label's name, and the text, e.g. the rule that fired and its evidence.
     */
    public HtmlReport callout(Level level, String calloutTitle, String text) {
        Objects.requireNonNull(level, "level");
        body.append("<div class=\"callout ").append(level.cssClass).append("\" role=\"note\">")
            .append("<div class=\"head\"><span class=\"badge\">").append(escape(level.symbol)).append(' ')
            .append(escape(level.badge)).append("</span><span class=\"title\">").append(escape(calloutTitle))
            .append("</span></div><p>").append(escape(text)).append("</p></div>\n");
        return this;
    }

    /** A table of plain-text cells, all left-aligned. */
    public HtmlReport table(List<String> headers, List<List<String>> rows) {
        return table(null, headers, rows, null);
    }

    /**
     * A table of plain-text cells.
     *
     * @param caption optional caption ({@code null} for none)
     * @param numericColumns optional: {@code true} for the columns to right-align with tabular
     *     digits (numbers formatted with {@link Numbers#format(double)}); {@code null} for none
     * @throws IllegalArgumentException a row's width differs from the header's
     */
    public HtmlReport table(String caption, List<String> headers, List<List<String>> rows, boolean[] numericColumns) {
        String[] classes = null;
        if (numericColumns != null) {
            classes = new String[numericColumns.length];
            for (int j = 0; j < classes.length; j++) {
                classes[j] = numericColumns[j] ? "num" : null;
            }
        }
        return styledTable(caption, headers, rows, classes);
    }

    /**
     * A table of plain-text cells with a style per column: {@code "num"} (right-aligned, tabular
     * digits), {@code "mono"} (monospaced, never wrapped: checksums, paths; the table scrolls
     * inside its box when too wide) or {@code null}.
     */
    public HtmlReport styledTable(String caption, List<String> headers, List<List<String>> rows, String[] columnClasses) {
        int width = headers.size();
        if (columnClasses != null && columnClasses.length != width) {
            throw new IllegalArgumentException("column styles: " + columnClasses.length + " entries, table has " + width + " columns");
        }
        body.append("<div class=\"table-wrap\"><table>\n");
        if (caption != null) {
            body.append("<caption>").append(escape(caption)).append("</caption>\n");
        }
        body.append("<thead><tr>");
        for (int j = 0; j < width; j++) {
            body.append("<th scope=\"col\"").append(numeric(columnClasses, j) ? " class=\"num\"" : "").append('>')
                .append(escape(headers.get(j))).append("</th>");
        }
        body.append("</tr></thead>\n<tbody>\n");
        for (List<String> row : rows) {
            if (row.size() != width) {
                throw new IllegalArgumentException("row has " + row.size() + " cells, table has " + width + " columns");
            }
            body.append("<tr>");
            for (int j = 0; j < width; j++) {
                String c = columnClasses == null ? null : columnClasses[j];
                body.append(c == null ? "<td>" : "<td class=\"" + escape(c) + "\">")
                    .append(escape(row.get(j))).append("</td>");
            }
            body.append("</tr>\n");
        }
        body.append("</tbody></table></div>\n");
        return this;
    }

    private static boolean numeric(String[] columnClasses, int j) {
        return columnClasses != null && "num".equals(columnClasses[j]);
    }

    /**
     * A picture embedded as a {@code data:} URI, with its caption and an alternative text for
     * screen readers (describe what the picture shows, e.g. its main finding).
     *
     * @throws IllegalArgumentException the bytes are not a PNG
     */
    public HtmlReport figure(byte[] pngBytes, String caption, String altText) {
        int[] size = pngSize(pngBytes);
        body.append("<figure><img src=\"data:image/png;base64,")
            .append(Base64.getEncoder().encodeToString(pngBytes))
            .append("\" width=\"").append(size[0]).append("\" height=\"").append(size[1])
            .append("\" alt=\"").append(escape(altText)).append("\">");
        if (caption != null) {
            body.append("<figcaption>").append(escape(caption)).append("</figcaption>");
        }
        body.append("</figure>\n");
        return this;
    }

    /**
     * Opens a collapsed block with a one-line summary that the reader clicks to open (HTML
     * {@code details}); everything added until {@link #endDetails()} is inside it. Printed open by
     * browsers that support {@code ::details-content} (Chromium 131 and later); elsewhere a closed
     * block does not print, so the summary should say what is inside.
     */
    public HtmlReport details(String summary) {
        body.append("<details><summary>").append(escape(summary)).append("</summary>\n");
        openDetails++;
        return this;
    }

    /** Closes the block opened by {@link #details(String)}. */
    public HtmlReport endDetails() {
        if (openDetails == 0) {
            throw new IllegalStateException("no open details block");
        }
        body.append("</details>\n");
        openDetails--;
        return this;
    }

    /** A bulleted list of plain-text items. */
    public HtmlReport list(List<String> items) {
        body.append("<ul>\n");
        for (String item : items) {
            body.append("<li>").append(escape(item)).append("</li>\n");
        }
        body.append("</ul>\n");
        return this;
    }

    /** Terms and their definitions (e.g. settings of the run and their values), in the given order. */
    public HtmlReport definitionList(List<Map.Entry<String, String>> entries) {
        body.append("<dl>\n");
        for (Map.Entry<String, String> e : entries) {
            body.append("<dt>").append(escape(e.getKey())).append("</dt><dd>").append(escape(e.getValue())).append("</dd>\n");
        }
        body.append("</dl>\n");
        return this;
    }

    /** A block of monospaced text (e.g. the protocol file or a command line), whitespace kept. */
    public HtmlReport preformatted(String text) {
        body.append("<pre>").append(escape(text)).append("</pre>\n");
        return this;
    }

    /** Adds a caution to the fixed footer (shown under "Cautions" at the end of every report). */
    public HtmlReport caution(String text) {
        cautions.add(text);
        return this;
    }

    /** The complete HTML document. Building it does not change the builder. */
    public String toHtml() {
        StringBuilder sb = new StringBuilder(body.length() + STYLE.length() + 4096);
        sb.append("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n")
            .append("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n")
            .append("<meta http-equiv=\"Content-Security-Policy\" content=\"").append(escape(CSP)).append("\">\n")
            .append("<title>").append(escape(title)).append("</title>\n")
            .append("<style>\n").append(STYLE).append("</style>\n</head>\n<body>\n<header>\n<h1>")
            .append(escape(title)).append("</h1>\n");
        if (subtitle != null) {
            sb.append("<p class=\"subtitle\">").append(escape(subtitle)).append("</p>\n");
        }
        sb.append("</header>\n");
        if (sectionTitles.size() > 1) {
            sb.append("<nav class=\"contents\" aria-label=\"Contents\"><strong>Contents:</strong> <ol>\n");
            for (int i = 0; i < sectionTitles.size(); i++) {
                sb.append("<li><a href=\"#s").append(i + 1).append("\">").append(escape(sectionTitles.get(i))).append("</a></li>\n");
            }
            if (!cautions.isEmpty()) {
                sb.append("<li><a href=\"#cautions\">Cautions</a></li>\n");
            }
            sb.append("</ol></nav>\n");
        }
        sb.append("<main>\n").append(body);
        sb.append("</details>\n".repeat(openDetails));
        if (closeSectionPending) {
            sb.append("</section>\n");
        }
        sb.append("</main>\n<footer>\n");
        if (!cautions.isEmpty()) {
            sb.append("<h2 id=\"cautions\">Cautions</h2>\n<ul>\n");
            for (String c : cautions) {
                sb.append("<li>").append(escape(c)).append("</li>\n");
            }
            sb.append("</ul>\n");
        }
        if (generatedBy != null) {
            sb.append("<p class=\"generated\">").append(escape(generatedBy)).append("</p>\n");
        }
        sb.append("</footer>\n</body>\n</html>\n");
        return sb.toString();
    }

    /** The report as UTF-8 bytes. */
    public byte[] toBytes() {
        return toHtml().getBytes(StandardCharsets.UTF_8);
    }

    /** Width and height from a PNG's IHDR chunk; rejects anything that is not a PNG. */
    static int[] pngSize(byte[] png) {
        byte[] signature = {(byte) 0x89, 'P', 'N', 'G', '\r', '\n', 0x1a, '\n'};
        if (png == null || png.length < 24) {
            throw new IllegalArgumentException("not a PNG image");
        }
        for (int i = 0; i < 8; i++) {
            if (png[i] != signature[i]) {
                throw new IllegalArgumentException("not a PNG image");
            }
        }
        if (!"IHDR".equals(new String(png, 12, 4, StandardCharsets.US_ASCII))) {
            throw new IllegalArgumentException("not a PNG image (no IHDR chunk)");
        }
        int w = readInt(png, 16);
        int h = readInt(png, 20);
        if (w <= 0 || h <= 0) {
            throw new IllegalArgumentException(String.format(Locale.ROOT, "PNG with invalid size %dx%d", w, h));
        }
        return new int[] {w, h};
    }

    private static int readInt(byte[] b, int off) {
        return ((b[off] & 0xff) << 24) | ((b[off + 1] & 0xff) << 16) | ((b[off + 2] & 0xff) << 8) | (b[off + 3] & 0xff);
    }
}
