package org.accordia.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import org.jsoup.Jsoup;
import org.jsoup.nodes.Document;
import org.jsoup.parser.Parser;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The components together, as the analyze command will use them, on an invented study
 * (three centres of the fictional "Aurora" study): every output written through one OutputFolder.
 */
class ReportAssemblyTest {

    @TempDir
    Path tmp;

    @Test
    void aCompleteReportFolder() throws Exception {
        Path dirProperty = System.getProperty("accordia.reportDir") == null ? null : Path.of(System.getProperty("accordia.reportDir"));
        OutputFolder out = OutputFolder.prepare(dirProperty != null ? dirProperty : tmp.resolve("out"), true);
        List<String> readers = List.of("R1", "R2", "R3", "R4", "<script>alert(1)</script>");
        List<String> centres = List.of("Harbour", "Harbour", "Hillside", "Hillside", "Lakeside");
        double[][] dice = {
            {1, .92, .74, .71, .80},
            {.92, 1, .72, .73, .79},
            {.74, .72, 1, .90, .78},
            {.71, .73, .90, 1, .77},
            {.80, .79, .78, .77, 1},
        };
        CsvTable table = new CsvTable(List.of("reader", "centre", "mean_dice_vs_others"));
        for (int i = 0; i < readers.size(); i++) {
            double sum = 0;
            for (int j = 0; j < readers.size(); j++) {
                sum += i == j ? 0 : dice[i][j];
            }
            table.addRow(CsvTable.text(readers.get(i)), CsvTable.text(centres.get(i)), CsvTable.number(sum / (readers.size() - 1)));
        }
        out.writeAtomically("readers.csv", table::write);
        out.writeAtomically(OutputFolder.SUMMARY_JSON, o -> JsonOutput.write(Map.of("readers", readers, "dice", dice), o));

        int n = 24;
        boolean[][] masks = new boolean[4][n * n];
        int[][] boxes = {{6, 16, 5, 15}, {7, 17, 6, 16}, {5, 14, 6, 17}, {6, 15, 4, 14}};
        for (int r = 0; r < 4; r++) {
            for (int y = boxes[r][2]; y <= boxes[r][3]; y++) {
                for (int x = boxes[r][0]; x <= boxes[r][1]; x++) {
                    masks[r][x + n * y] = (x - 11) * (x - 11) + (y - 11) * (y - 11) < 40 + 6 * r;
                }
            }
        }
        float[] bg = new float[n * n];
        for (int i = 0; i < bg.length; i++) {
            int x = i % n;
            int y = i / n;
            bg[i] = (float) (200 * Math.exp(-((x - 11) * (x - 11) + (y - 12) * (y - 12)) / 60.0) + 3 * ((x * 7 + y * 13) % 5));
        }
        byte[] overlay = Overlays.render(bg, n, n, 0.8, 0.8, List.of(
            new Overlays.Contour("R1", "Harbour", masks[0]), new Overlays.Contour("R2", "Harbour", masks[1]),
            new Overlays.Contour("R3", "Hillside", masks[2]), new Overlays.Contour("R4", "Hillside", masks[3])),
            "case-07 \u00B7 liver \u00B7 axial slice z = 23");

        HtmlReport report = new HtmlReport("Aurora study: annotation agreement")
            .subtitle("Invented demonstration data: 3 centres, 5 readers, 1 label")
            .generatedBy("Accordia (test build)")
            .section("Decision")
            .callout(HtmlReport.Level.REVIEW, "liver", "Between-centre share of variance 18 % exceeds 10 %; centre Hillside differs by 1.4 mm.")
            .callout(HtmlReport.Level.POOL, "spleen", "All rules passed.")
            .callout(HtmlReport.Level.REANNOTATE, "lesion", "Median Dice 0.41 is below 0.5.")
            .section("Agreement between readers")
            .figure(Charts.agreementMatrix(readers, centres, dice, "Mean Dice between readers, liver", 720, 600),
                "Mean Dice for every pair of readers, grouped by centre.", "Heatmap: readers of the same centre agree more.")
            .table("Readers", table.headers(), List.of(List.of("R1", "Harbour", "0.8275")), new boolean[] {false, false, true})
            .section("Centre effects")
            .figure(Charts.intervalPlot(List.of("Harbour", "Hillside", "Lakeside"), new double[] {0.2, 1.4, -0.3},
                new double[] {-0.2, 0.9, -0.9}, new double[] {0.6, 1.9, 0.3}, "Signed surface distance (mm)", 0, 0.5,
                "Centre effect on the boundary", 720, 320), "Centre effects with 95 % intervals.", "Forest plot of centre effects.")
            .figure(Charts.stackedShares(List.of("case", "within centre", "between centres"), new double[] {60, 22, 18},
                "Variance components, liver HD95", 720, 200), "Shares of the variance.", "Stacked bar of variance shares.")
            .section("Cases")
            .figure(Charts.rankedBars(List.of("case-01", "case-02", "case-03", "case-04", "case-05", "case-06", "case-07"),
                new double[] {0.05, 0.12, 0.08, 0.31, 0.09, 0.14, 0.27}, 0.2, "1 \u2212 median Dice (unitless)",
                "Cases ranked by disagreement", 720, 380), "Cases above the line go to adjudication.", "Bar chart of disagreement.")
            .figure(overlay, "Case 07, slice with the most disputed voxels.", "Four reader contours on one slice.")
            .definitionList(List.of(Map.entry("Seed", "20261202"), Map.entry("Threshold", "0.2")))
            .preformatted("accordia analyze study/ --out report/")
            .caution("A research and quality tool, not a diagnostic device.")
            .caution("Invented data.");
        Path html = out.writeString(OutputFolder.REPORT_HTML, report.toHtml());

        Parser parser = Parser.htmlParser().setTrackErrors(50);
        Document doc = Jsoup.parse(Files.readString(html), "", parser);
        assertTrue(parser.getErrors().isEmpty(), parser.getErrors().toString());
        assertEquals(5, doc.select("img[src^=data:image/png;base64,]").size());
        assertTrue(doc.select("script").isEmpty());
        try (var s = Files.list(out.dir())) {
            assertEquals(List.of("readers.csv", "report.html", "summary.json"),
                s.map(p -> p.getFileName().toString()).sorted().toList());
        }
        assertTrue(Files.readString(out.dir().resolve("readers.csv")).contains("\"<script>alert(1)</script>\"")
            || Files.readString(out.dir().resolve("readers.csv")).contains("<script>alert(1)</script>,"));
    }
}
