package org.accordia.report;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.io.ByteArrayInputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import java.util.function.Supplier;
import java.util.stream.Stream;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;

class ChartsTest {

    static final double NAN = Double.NaN;

    static Stream<Arguments> charts() {
        List<String> readers = List.of("R4", "R1", "R3", "R2", "R5");
        List<String> centres = List.of("North", "South", "North", "South", "East");
        double[][] dice = {
            {1, .71, .90, .70, NAN},
            {.71, 1, .72, .91, .65},
            {.90, .72, 1, .69, .66},
            {.70, .91, .69, 1, .64},
            {NAN, .65, .66, .64, 1},
        };
        return Stream.of(
            Arguments.of("matrix", 640, 560, (Supplier<byte[]>) () ->
                Charts.agreementMatrix(readers, centres, dice, "Mean Dice between readers <liver>", 640, 560)),
            Arguments.of("interval", 640, 360, (Supplier<byte[]>) () ->
                Charts.intervalPlot(List.of("North", "South", "East", "West"), new double[] {0.4, -1.2, NAN, 0.1},
                    new double[] {-0.1, -1.9, NAN, NAN}, new double[] {0.9, -0.5, NAN, 0.6},
                    "Signed surface distance to the consensus (mm)", 0.0, 0.5, "Centre effect on boundary position", 640, 360)),
            Arguments.of("interval-no-band", 500, 300, (Supplier<byte[]>) () ->
                Charts.intervalPlot(List.of("North", "South"), new double[] {1.05, 0.93},
                    new double[] {0.98, 0.88}, new double[] {1.12, 0.99},
                    "Volume ratio to the consensus (unitless)", 1.0, null, "Volume ratio by centre", 500, 300)),
            Arguments.of("scatter", 600, 480, (Supplier<byte[]>) () ->
                Charts.scatter(List.of("R1", "R2", "R3", "R4", "R5"), List.of("South", "South", "North", "North", "East"),
                    new double[] {0.91, 0.85, 0.95, 0.88, NAN}, new double[] {0.998, 0.999, 0.997, 0.9995, 0.99},
                    "Sensitivity (fraction)", "Specificity (fraction)", "Reader performance against the consensus", 600, 480)),
            Arguments.of("shares", 600, 220, (Supplier<byte[]>) () ->
                Charts.stackedShares(List.of("within reader", "within centre", "between centres"), new double[] {2.0, 5.0, 3.0},
                    "Variance components of HD95", 600, 220)),
            Arguments.of("shares-multi", 640, 320, (Supplier<byte[]>) () ->
                Charts.stackedShares(List.of("liver", "spleen", "lesion"), List.of("case", "within centre", "between centres"),
                    new double[][] {{6, 3, 1}, {4, 4, 2}, {1, 2, -0.5}}, "Variance components by label", 640, 320)),
            Arguments.of("ranked", 700, 400, (Supplier<byte[]>) () ->
                Charts.rankedBars(List.of("c01", "c02", "c03", "c04", "c05", "c06", "c07"),
                    new double[] {0.05, 0.31, 0.12, NAN, 0.22, 0.08, 0.12},
                    0.2, "Disagreement, 1 \u2212 median Dice (unitless)", "Cases ranked by disagreement", 700, 400)),
            Arguments.of("ranked-absent", 700, 400, (Supplier<byte[]>) () ->
                Charts.rankedBars(List.of("c01", "c02", "c03", "c04"), new double[] {0.05, 0.31, 0.0, 0.4},
                    List.of("drawn", "drawn", "absent", "partly_drawn"), 0.2, "1 \u2212 median Dice", "Ranked", 700, 400)),
            Arguments.of("scatter-proportions", 600, 480, (Supplier<byte[]>) () ->
                Charts.scatter(List.of("R1", "R2", "R3"), List.of("South", "North", "East"),
                    new double[] {0.998, 1.0, 0.997}, new double[] {0.91, 1.0, 0.95},
                    "Specificity", "Sensitivity", true, "Readers", 600, 480)));
    }

    @Test
    void proportionAxesHaveRoundTicksWithinZeroAndOne() {
        // values close to 1, as sensitivities and specificities are: the old axis ran to 1.02 in steps of 0.01
        for (double[] values : List.of(new double[] {0.93, 0.97, 1.0}, new double[] {0.997, 0.998, 1.0},
                new double[] {0.2, 0.55, 0.9}, new double[] {NAN, 0.5})) {
            Charts.ProportionAxis axis = new Charts.ProportionAxis("p");
            Charts.proportionRange(axis, values, 0.12);
            java.awt.image.BufferedImage img = new java.awt.image.BufferedImage(10, 10, java.awt.image.BufferedImage.TYPE_INT_RGB);
            java.awt.Graphics2D g = img.createGraphics();
            List<?> ticks = axis.refreshTicks(g, new org.jfree.chart.axis.AxisState(),
                new java.awt.geom.Rectangle2D.Double(0, 0, 400, 400), org.jfree.chart.ui.RectangleEdge.LEFT);
            g.dispose();
            double unit = axis.getTickUnit().getSize();
            assertTrue(List.of(0.001, 0.002, 0.005, 0.01, 0.02, 0.05, 0.1, 0.2, 0.25).contains(unit), "unit " + unit);
            assertTrue(ticks.size() >= 3 && ticks.size() <= 8, ticks.size() + " ticks");
            for (Object t : ticks) {
                double v = ((org.jfree.chart.axis.NumberTick) t).getValue();
                assertTrue(v >= -1e-9 && v <= 1 + 1e-9, "tick outside [0, 1]: " + v);
                assertEquals(0, Math.abs(v / unit - Math.rint(v / unit)), 1e-6, "tick not on a round step: " + v);
            }
            for (double v : values) {
                if (!Double.isNaN(v)) {
                    assertTrue(axis.getRange().contains(v), v + " outside " + axis.getRange());
                }
            }
        }
    }

    @Test
    void heatMapsShareOneColourScale() {
        double[][] a = {{1, 0.82}, {0.82, 1}};
        double[][] b = {{1, 0.47}, {0.47, NAN}};
        assertEquals(0.4, Charts.colourScaleLower(List.of(a, b)), 1e-12);
        assertEquals(0.8, Charts.colourScaleLower(List.<double[][]>of(a)), 1e-12);
        assertEquals(0.0, Charts.colourScaleLower(List.<double[][]>of(new double[][] {{NAN}})), 1e-12);
        // one colour, one value: the same Dice gets the same colour in both maps when the scale is shared
        Charts.SequentialScale shared = new Charts.SequentialScale(0.4, 1.0);
        assertEquals(shared.getPaint(0.82), new Charts.SequentialScale(0.4, 1.0).getPaint(0.82));
        assertNotEquals(shared.getPaint(0.82), new Charts.SequentialScale(0.8, 1.0).getPaint(0.82));
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("charts")
    void producesAValidDeterministicPngOfTheRequestedSize(String name, int w, int h, Supplier<byte[]> make) throws Exception {
        byte[] png = make.get();
        BufferedImage img = ImageIO.read(new ByteArrayInputStream(png));
        assertEquals(w, img.getWidth());
        assertEquals(h, img.getHeight());
        Set<Integer> colours = new HashSet<>();
        for (int y = 0; y < h; y += 2) {
            for (int x = 0; x < w; x += 2) {
                colours.add(img.getRGB(x, y));
            }
        }
        assertTrue(colours.size() > 30, name + ": only " + colours.size() + " colours");
        assertArrayEquals(png, make.get(), "same input, same bytes");
        String dir = System.getProperty("accordia.chartDir");
        if (dir != null) {
            Files.createDirectories(Path.of(dir));
            Files.write(Path.of(dir, name + ".png"), png);
        }
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("charts")
    void chartsShowOurPaletteColours(String name, int w, int h, Supplier<byte[]> make) throws Exception {
        BufferedImage img = ImageIO.read(new ByteArrayInputStream(make.get()));
        Set<Integer> colours = new HashSet<>();
        for (int y = 0; y < h; y++) {
            for (int x = 0; x < w; x++) {
                colours.add(img.getRGB(x, y) & 0xffffff);
            }
        }
        boolean any = false;
        for (int i = 0; i < Palette.categoryCount(); i++) {
            any |= colours.contains(Palette.category(i).getRGB() & 0xffffff);
        }
        for (double t = 0; t <= 1; t += 0.01) {
            any |= colours.contains(Palette.sequential(t).getRGB() & 0xffffff);
        }
        assertTrue(any, name);
    }

    @org.junit.jupiter.api.Test
    void rejectsBadInput() {
        assertThrows(IllegalArgumentException.class, () -> Charts.rankedBars(List.of("a"), new double[2], 0.2, "x", "t", 300, 200));
        assertThrows(IllegalArgumentException.class, () -> Charts.rankedBars(List.of("a"), new double[1], 0.2, "x", "t", 10, 200));
        assertThrows(IllegalArgumentException.class,
            () -> Charts.agreementMatrix(List.of("a", "b"), List.of("c", "c"), new double[][] {{1, 1}, {1}}, "t", 300, 300));
    }
}
