package org.accordia.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.util.ArrayList;
import java.util.HexFormat;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.TreeSet;
import org.apache.commons.csv.CSVRecord;
import org.jsoup.nodes.Document;
import org.jsoup.nodes.Element;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * What the outputs of the demo study show a study lead: structures absent from a case as their own
 * state (never as perfect agreement), consistent case counts, and a report whose decision comes
 * first, whose run can be audited (time, command, study folder, protocol and its SHA-256) and
 * whose long parts are collapsed. One analysis of the demo study, several checks.
 *
 * <p>Which cases have no core is read from pairs.csv (every pair of the case flagged
 * {@code both_empty}), not from the code under test.
 */
class ReportPresentationTest {
    @TempDir
    static Path tmp;
    static Path out;
    static Path protocol;

    @BeforeAll
    static void analyseTheDemo() throws Exception {
        Path study = tmp.resolve("study");
        AnalyzeCommandTest.copy(Path.of("demo-masks"), study);
        protocol = AnalyzeCommandTest.quickProtocol(tmp);
        out = tmp.resolve("out");
        CliRun r = CliRun.of("analyze", study.toString(), "--protocol", protocol.toString(), "--out", out.toString(),
            "--quiet");
        assertEquals(ExitCodes.OK, r.code(), r.err());
    }

    /** (case, structure) pairs in which every reader pair is both-empty, from pairs.csv. */
    static TreeSet<String> absentFromPairs() throws Exception {
        Map<String, Boolean> allBothEmpty = new TreeMap<>();
        for (CSVRecord p : AnalyzeCommandTest.csv(out.resolve("pairs.csv"))) {
            String key = p.get("case") + "/" + p.get("label");
            allBothEmpty.merge(key, p.get("flag").equals("both_empty"), Boolean::logicalAnd);
        }
        TreeSet<String> absent = new TreeSet<>();
        allBothEmpty.forEach((k, v) -> {
            if (v) {
                absent.add(k);
            }
        });
        return absent;
    }

    @Test
    void absentStructuresAreTheirOwnStateInTheTables() throws Exception {
        TreeSet<String> absent = absentFromPairs();
        assertEquals(4, absent.size(), "the demo has cases without a core: " + absent);
        for (CSVRecord c : AnalyzeCommandTest.csv(out.resolve("cases.csv"))) {
            String key = c.get("case") + "/" + c.get("label");
            if (absent.contains(key)) {
                assertEquals("absent", c.get("state"), key);
                assertEquals("0", c.get("readers_drawing"), key);
                assertEquals("absent", c.get("flags"), key);
                for (String col : List.of("mean_dice", "median_dice", "worst_reader_a", "worst_reader_b", "worst_dice")) {
                    assertEquals("", c.get(col), key + " " + col + ": no agreement to report");
                }
            } else {
                assertFalse(c.get("state").equals("absent"), key);
                assertFalse(c.get("median_dice").isEmpty(), key);
                assertEquals(c.get("readers_present"), c.get("readers_drawing"), key + ": every demo reader draws");
                assertEquals("drawn", c.get("state"), key);
            }
        }
        // one "absent" event per case and structure, and no per-reader empty masks for those cases
        List<String> absentEvents = new ArrayList<>();
        for (CSVRecord e : AnalyzeCommandTest.csv(out.resolve("events.csv"))) {
            String key = e.get("case") + "/" + e.get("label");
            if (e.get("kind").equals("absent")) {
                absentEvents.add(key);
            } else {
                assertFalse(absent.contains(key), "non-event listed for an absent structure: " + e);
            }
        }
        assertEquals(new ArrayList<>(absent), absentEvents);
        JsonNode summary = new ObjectMapper().readTree(out.resolve("summary.json").toFile());
        assertEquals(absent.size(), summary.get("flagged_events").get("absent").asInt());
        assertEquals(0, summary.get("flagged_events").get("empty_mask").asInt());
    }

    @Test
    void caseCountsAgreeBetweenReaderAndCentreTables() throws Exception {
        Map<String, String> centreCases = new TreeMap<>();
        for (CSVRecord c : AnalyzeCommandTest.csv(out.resolve("centres.csv"))) {
            centreCases.merge(c.get("label"), c.get("cases"), (a, b) -> a.equals(b) ? a : a + "|" + b);
        }
        assertEquals("6", centreCases.get("core"), "10 cases less the 4 without a core");
        for (CSVRecord s : AnalyzeCommandTest.csv(out.resolve("reader_summary.csv"))) {
            assertEquals(centreCases.get(s.get("label")), s.get("cases"), s.toString());
        }
    }

    @Test
    void reportLeadsWithTheDecisionAndDocumentsTheRun() throws Exception {
        Document doc = AnalyzeCommandTest.parseStrict(out.resolve("report.html"));
        List<String> sections = doc.select("main > section > h2").eachText();
        assertEquals("Decision", sections.get(0));
        assertEquals(List.of("Methods", "Run"), sections.subList(sections.size() - 2, sections.size()));
        assertEquals("Cautions", doc.select("nav.contents a").last().text());
        assertEquals(1, doc.select("footer #cautions").size());
        // the first thing after the header and contents is the first decision box
        Element first = doc.selectFirst("main > section");
        assertTrue(first.select(".callout").size() >= 2, "a decision box per structure");

        // methods and checksums collapsed; hashes whole, in a monospaced cell
        Element methods = doc.select("main > section").get(sections.indexOf("Methods"));
        assertEquals(1, methods.select("details").size());
        assertTrue(methods.selectFirst("details").text().contains("Dice = 2|A∩B|"), "formulas inside the block");
        Element run = doc.select("main > section").get(sections.indexOf("Run"));
        Element checksums = run.selectFirst("details table");
        assertTrue(checksums != null, "checksum table inside a collapsed block");
        for (Element hash : checksums.select("tbody td:nth-child(3)")) {
            assertTrue(hash.hasClass("mono"));
            assertTrue(hash.text().matches("[0-9a-f]{64}"), hash.text());
        }

        Map<String, String> facts = new TreeMap<>();
        List<Element> dts = run.select("dl > dt");
        for (Element dt : dts) {
            facts.put(dt.text(), dt.nextElementSibling().text());
        }
        assertTrue(facts.get("Started (UTC)").matches("\\d{4}-\\d\\d-\\d\\dT\\d\\d:\\d\\d:\\d\\dZ"), facts.toString());
        assertTrue(facts.get("Command").startsWith("accordia analyze "), facts.toString());
        assertTrue(facts.get("Command").contains("--protocol " + protocol), facts.toString());
        assertEquals(tmp.resolve("study").toAbsolutePath().normalize().toString(), facts.get("Study folder"));
        String sha = HexFormat.of().formatHex(MessageDigest.getInstance("SHA-256").digest(Files.readAllBytes(protocol)));
        assertEquals(sha, facts.get("Protocol SHA-256"));
        assertTrue(facts.get("Software").startsWith("Accordia "), facts.toString());
    }

    @Test
    void reportExplainsAbsenceIccFormsAndSharedScale() throws Exception {
        Document doc = AnalyzeCommandTest.parseStrict(out.resolve("report.html"));
        String text = doc.text();
        assertTrue(text.contains("core: absent in 4 of 10 cases (no reader drew it): case01, case03, case04, case05."),
            "one line per structure for the absences");
        assertFalse(doc.select("table").eachText().stream().anyMatch(t -> t.contains("empty_mask")),
            "no flood of empty-mask rows");
        // ICC: one question per form
        Element icc = doc.select("table").stream().filter(t -> t.text().contains("Question it answers")).findFirst()
            .orElseThrow();
        List<Element> rows = icc.select("tbody tr");
        assertEquals(12, rows.size(), "six Shrout & Fleiss forms per structure");
        for (Element row : rows) {
            assertTrue(row.child(3).text().endsWith("?") || row.child(3).text().endsWith("."), row.text());
        }
        // the heat maps say they share one scale, and which
        List<String> captions = doc.select("figure figcaption").eachText().stream()
            .filter(c -> c.startsWith("Mean Dice over the cases")).toList();
        assertEquals(2, captions.size());
        assertTrue(captions.get(0).contains("same colour scale, from ") && captions.get(0).endsWith("to 1."),
            captions.get(0));
        assertEquals(captions.get(0).substring(captions.get(0).indexOf("same colour scale")),
            captions.get(1).substring(captions.get(1).indexOf("same colour scale")));
        assertTrue(captions.get(1).contains("4 cases where no reader drew it left out"), captions.get(1));
        // contour pictures name the plane from the affine and say the letters are anatomical directions
        assertTrue(text.contains("letters at the edges give the anatomical directions"), "picture note");
    }
}
