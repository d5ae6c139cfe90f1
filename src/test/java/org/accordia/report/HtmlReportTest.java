package org.accordia.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.io.ByteArrayOutputStream;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import javax.imageio.ImageIO;
import org.jsoup.Jsoup;
import org.jsoup.nodes.Attribute;
import org.jsoup.nodes.Document;
import org.jsoup.nodes.Element;
import org.jsoup.parser.ParseErrorList;
import org.jsoup.parser.Parser;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

class HtmlReportTest {

    static final String HOSTILE = "<script>alert(1)</script>";

    static byte[] png(int w, int h) throws Exception {
        BufferedImage img = new BufferedImage(w, h, BufferedImage.TYPE_INT_RGB);
        img.setRGB(1, 1, 0xff0000);
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        ImageIO.write(img, "png", out);
        return out.toByteArray();
    }

    static HtmlReport sample() throws Exception {
        return new HtmlReport("Study \"Aurora\" <draft>")
            .subtitle("Fictional study, 3 centres")
            .generatedBy("Accordia 0.1.0")
            .section("Decisions")
            .callout(HtmlReport.Level.POOL, "liver", "Between-centre share 4 % below 10 %.")
            .callout(HtmlReport.Level.REVIEW, "spleen & kidney", "Centre B differs by 1.8 mm.")
            .callout(HtmlReport.Level.REANNOTATE, HOSTILE, "Rule 3 fired: p < 0.001.")
            .section("Readers " + HOSTILE)
            .paragraph("Reader " + HOSTILE + " read 12 cases; O'Brien read 3.")
            .table("Per reader", List.of("reader", "dice"), List.of(List.of(HOSTILE, "0.91"), List.of("R2", "-1.5")),
                new boolean[] {false, true})
            .table(List.of("a"), List.of(List.of("x")))
            .figure(png(40, 30), "Agreement " + HOSTILE, "alt \" onerror=\"alert(2)")
            .list(List.of("one", HOSTILE))
            .definitionList(List.of(Map.entry("seed", "42"), Map.entry(HOSTILE, "x")))
            .preformatted("a  b\n" + HOSTILE + "\u0007")
            .caution("Research tool, not a diagnostic device.")
            .caution("Case " + HOSTILE + " had an empty mask.");
    }

    @Test
    void isAStrictlyWellFormedSelfContainedDocument() throws Exception {
        String html = sample().toHtml();
        // jsoup's HTML5 parser with error tracking: a conforming tree builds without parse errors.
        Parser parser = Parser.htmlParser().setTrackErrors(100);
        Document doc = Jsoup.parse(html, "", parser);
        ParseErrorList errors = parser.getErrors();
        assertTrue(errors.isEmpty(), errors.toString());
        assertTrue(html.startsWith("<!DOCTYPE html>\n"));
        // exactly one html/head/body element in the source (the parser would add missing ones)
        for (String tag : List.of("html", "head", "body", "title", "main", "footer")) {
            assertEquals(1, count(html, "<" + tag + "[ >]"), tag);
            assertEquals(1, count(html, "</" + tag + ">"), tag);
        }
        assertEquals(1, doc.select("head > meta[charset=utf-8]").size());
        assertEquals("Study \"Aurora\" <draft>", doc.title());
        assertEquals("en", doc.selectFirst("html").attr("lang"));
        // self-contained: no script, no link element, no iframe/object, no external reference
        assertTrue(doc.select("script, link, iframe, object, embed, base, form").isEmpty());
        for (Element img : doc.select("img")) {
            assertTrue(img.attr("src").startsWith("data:image/png;base64,"));
            assertFalse(img.attr("alt").isEmpty());
        }
        for (Element e : doc.getAllElements()) {
            for (Attribute a : e.attributes()) {
                if (a.getKey().equals("content")) {
                    continue; // the CSP meta names schemes, checked below
                }
                String v = a.getValue().toLowerCase(Locale.ROOT);
                assertFalse(v.startsWith("http:") || v.startsWith("https:") || v.startsWith("//") || v.startsWith("javascript:"),
                    e.tagName() + " " + a);
                assertFalse(a.getKey().startsWith("on"), "event handler attribute " + a);
            }
        }
        String lower = html.toLowerCase(Locale.ROOT);
        assertFalse(lower.contains("http:"));
        assertFalse(lower.contains("https:"));
        assertFalse(lower.contains("<link"));
        assertFalse(lower.contains("<script"));
        assertFalse(lower.contains("url("), "no CSS url() of any kind");
        assertFalse(lower.contains("@import"));
        assertFalse(lower.contains("@font-face"));
        String csp = doc.selectFirst("meta[http-equiv=Content-Security-Policy]").attr("content");
        assertTrue(csp.contains("default-src 'none'") && csp.contains("img-src data:"), csp);
    }

    @Test
    void hostileNamesShowAsText() throws Exception {
        String html = sample().toHtml();
        Document doc = Jsoup.parse(html);
        assertTrue(doc.select("script").isEmpty());
        assertTrue(doc.selectFirst(".callout.reannotate .title").text().equals(HOSTILE));
        assertEquals("Reader " + HOSTILE + " read 12 cases; O'Brien read 3.", doc.selectFirst("main > section > p").text());
        assertEquals(HOSTILE, doc.selectFirst("tbody td").text());
        assertEquals("alt \" onerror=\"alert(2)", doc.selectFirst("img").attr("alt"));
        assertFalse(doc.selectFirst("img").hasAttr("onerror"));
        assertEquals("Case " + HOSTILE + " had an empty mask.", doc.select("footer li").get(1).text());
        assertEquals("a  b\n" + HOSTILE + "\uFFFD", doc.selectFirst("pre").wholeText());
        assertTrue(html.contains("&lt;script&gt;alert(1)&lt;/script&gt;"));
    }

    // Expected escapes from the HTML 4 / HTML5 named character references (&amp; &lt; &gt; &quot;)
    // and the numeric reference &#39; for the apostrophe.
    @ParameterizedTest
    @CsvSource(delimiter = '|', quoteCharacter = '`', value = {
        "<b>          | &lt;b&gt;",
        "a & b        | a &amp; b",
        "`\"q\"`      | &quot;q&quot;",
        "O'Brien      | O&#39;Brien",
        "plain        | plain",
        "`x\u0007y`   | x\uFFFDy",
    })
    void escapesTheHtmlSignificantCharacters(String in, String expected) {
        assertEquals(expected, HtmlReport.escape(in));
    }

    @Test
    void decisionLevelsDifferByBadgeTextNotOnlyColour() throws Exception {
        Document doc = Jsoup.parse(sample().toHtml());
        List<String> badges = doc.select(".callout .badge").eachText();
        assertEquals(List.of("\u2713 POOL", "! REVIEW", "\u2716 RE-ANNOTATE"), badges);
        assertEquals(3, doc.select(".callout[role=note]").size());
    }

    @Test
    void structureTablesFiguresAndFooter() throws Exception {
        Document doc = Jsoup.parse(sample().toHtml());
        assertEquals(2, doc.select("main > section").size());
        // the footer's cautions are listed in the contents too, and the link leads to them
        assertEquals(List.of("Decisions", "Readers " + HOSTILE, "Cautions"), doc.select("nav.contents a").eachText());
        assertEquals("#s2", doc.select("nav.contents a").get(1).attr("href"));
        assertEquals("Cautions", doc.select(doc.select("nav.contents a").get(2).attr("href")).text());
        assertEquals(1, doc.select("#s2").size());
        Element numeric = doc.select("table").first();
        assertEquals(List.of("dice"), numeric.select("th.num").eachText());
        assertEquals(List.of("0.91", "-1.5"), numeric.select("td.num").eachText());
        assertEquals("Per reader", numeric.selectFirst("caption").text());
        Element img = doc.selectFirst("figure img");
        assertEquals("40", img.attr("width"));
        assertEquals("30", img.attr("height"));
        assertEquals("Agreement " + HOSTILE, doc.selectFirst("figcaption").text());
        assertEquals("Cautions", doc.selectFirst("footer h2").text());
        assertEquals("Accordia 0.1.0", doc.selectFirst("footer .generated").text());
        assertEquals(List.of("seed", HOSTILE), doc.select("dl dt").eachText());
    }

    @Test
    void sameInputSameBytesAndRejectsNonPng() throws Exception {
        assertEquals(sample().toHtml(), sample().toHtml());
        HtmlReport r = new HtmlReport("x");
        assertThrows(IllegalArgumentException.class, () -> r.figure(new byte[] {1, 2, 3}, "c", "a"));
        assertThrows(IllegalArgumentException.class,
            () -> r.table(null, List.of("a", "b"), List.of(List.of("1")), null));
    }

    private static int count(String s, String regex) {
        Matcher m = Pattern.compile(regex).matcher(s);
        int n = 0;
        while (m.find()) {
            n++;
        }
        return n;
    }

    @Test
    void randomHostileTextsRoundTripAsText() {
        java.util.Random rnd = new java.util.Random(11);
        String alphabet = "<>&\"'=/ab \u00e9;#x";
        for (int i = 0; i < 300; i++) {
            StringBuilder sb = new StringBuilder();
            int len = 1 + rnd.nextInt(30);
            for (int k = 0; k < len; k++) {
                sb.append(alphabet.charAt(rnd.nextInt(alphabet.length())));
            }
            String text = sb.toString();
            Document doc = Jsoup.parse(new HtmlReport("t").preformatted(text).figure(PNG_1, text, text).toHtml());
            assertEquals(text, doc.selectFirst("pre").wholeText());
            assertEquals(text, doc.selectFirst("img").attr("alt"));
            assertEquals(1, doc.select("body *").select("img").size());
            assertTrue(doc.select("script").isEmpty());
        }
    }

    static final byte[] PNG_1;

    static {
        try {
            PNG_1 = png(2, 2);
        } catch (Exception e) {
            throw new IllegalStateException(e);
        }
    }

    @Test
    void collapsedBlocksAndMonospacedColumns() throws Exception {
        HtmlReport h = new HtmlReport("t").section("Run").paragraph("before")
            .details("SHA-256 of 2 files")
            .styledTable(null, List.of("File", "SHA-256"), List.of(List.of("a.nii", "ab".repeat(32))),
                new String[] {"mono", "mono"})
            .endDetails()
            .paragraph("after")
            .details("left open by the caller");
        Document doc = Jsoup.parse(h.toHtml());
        assertEquals(2, doc.select("details").size(), "an open block is closed at the end");
        assertEquals("SHA-256 of 2 files", doc.selectFirst("details > summary").text());
        assertEquals("ab".repeat(32), doc.selectFirst("details td.mono:nth-child(2)").text());
        assertEquals("after", doc.select("section > p").last().text(), "text after endDetails is outside the block");
        assertThrows(IllegalStateException.class, () -> new HtmlReport("t").endDetails());
        // printed open where the browser can (Chromium's ::details-content)
        assertTrue(h.toHtml().contains("details::details-content{content-visibility:visible"));
    }
}
