package org.accordia.report;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.awt.Graphics2D;
import java.awt.Paint;
import java.awt.Shape;
import java.awt.TexturePaint;
import java.awt.geom.Rectangle2D;
import java.awt.image.BufferedImage;
import java.text.DecimalFormat;
import java.text.DecimalFormatSymbols;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.TreeMap;
import org.accordia.analysis.StructureCase;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.LegendItem;
import org.jfree.chart.LegendItemCollection;
import org.jfree.chart.annotations.XYTextAnnotation;
import org.jfree.chart.axis.AxisLocation;
import org.jfree.chart.axis.AxisState;
import org.jfree.chart.axis.CategoryAxis;
import org.jfree.chart.axis.CategoryLabelPositions;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.axis.NumberTick;
import org.jfree.chart.axis.SymbolAxis;
import org.jfree.chart.axis.ValueAxis;
import org.jfree.chart.block.BlockBorder;
import org.jfree.chart.labels.ItemLabelAnchor;
import org.jfree.chart.labels.ItemLabelPosition;
import org.jfree.chart.labels.StandardCategoryItemLabelGenerator;
import org.jfree.chart.plot.CategoryPlot;
import org.jfree.chart.plot.DefaultDrawingSupplier;
import org.jfree.chart.plot.IntervalMarker;
import org.jfree.chart.plot.Plot;
import org.jfree.chart.plot.PlotOrientation;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.PaintScale;
import org.jfree.chart.renderer.category.BarRenderer;
import org.jfree.chart.renderer.category.StackedBarRenderer;
import org.jfree.chart.renderer.category.StandardBarPainter;
import org.jfree.chart.renderer.xy.XYBlockRenderer;
import org.jfree.chart.renderer.xy.XYErrorRenderer;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.chart.title.LegendTitle;
import org.jfree.chart.title.PaintScaleLegend;
import org.jfree.chart.title.TextTitle;
import org.jfree.chart.ui.Layer;
import org.jfree.chart.ui.RectangleAnchor;
import org.jfree.chart.ui.RectangleEdge;
import org.jfree.chart.ui.RectangleInsets;
import org.jfree.chart.ui.TextAnchor;
import org.jfree.data.category.CategoryDataset;
import org.jfree.data.category.DefaultCategoryDataset;
import org.jfree.data.xy.DefaultXYZDataset;
import org.jfree.data.xy.XIntervalSeries;
import org.jfree.data.xy.XIntervalSeriesCollection;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;

/**
 * The charts of the report, drawn with JFreeChart off-screen and returned as PNG bytes of exactly
 * the requested size. Every chart has a title, axis labels with units, our own colours
 * ({@link Palette}) and fonts from the platform's logical {@code SansSerif} family. Rendering is
 * deterministic: the same input on the same machine gives the same bytes (no time stamps, no hash
 * order; fonts may differ between machines).
 *
 * <p>Undefined values (NaN) are never drawn as if they were numbers: they are shown distinctly
 * (hatched cells) or left out and named in a note under the chart.
 */
public final class Charts {
    static final Font TITLE_FONT = new Font(Font.SANS_SERIF, Font.BOLD, 16);
    static final Font LABEL_FONT = new Font(Font.SANS_SERIF, Font.PLAIN, 13);
    static final Font TICK_FONT = new Font(Font.SANS_SERIF, Font.PLAIN, 11);
    static final Font NOTE_FONT = new Font(Font.SANS_SERIF, Font.ITALIC, 11);
    /** Above this many cases the case names are not printed under the bars. */
    public static final int MAX_NAMED_BARS = 60;
    /** Up to this many readers the agreement matrix prints each cell's value. */
    public static final int MAX_ANNOTATED_READERS = 14;

    private Charts() {
    }

    // ------------------------------------------------------------------ agreement matrix

    /**
     * Reader-by-reader heatmap of mean pairwise Dice. Readers are ordered by centre (then by name);
     * each centre's block is outlined by lines and named on the top and right edges, so that higher
     * agreement within centres than between them (a block pattern) shows at a glance. The colour
     * scale runs from the lowest defined value (rounded down to a tenth) to 1; NaN cells (no case
     * read by both) are hatched and explained in a note. Values are printed in the cells when there
     * are at most {@value #MAX_ANNOTATED_READERS} readers.
     *
     * @param readers reader names; {@code centres} aligned with them
     * @param meanDice square matrix, {@code meanDice[i][j]} for readers i and j in the given order
     */
    public static byte[] agreementMatrix(List<String> readers, List<String> centres, double[][] meanDice,
                                         String title, int widthPx, int heightPx) {
        return agreementMatrix(readers, centres, meanDice, Double.NaN, title, widthPx, heightPx);
    }

    /**
     * The lower end of the colour scale for these matrices: the lowest defined value over all of
     * them, rounded down to a tenth, between 0 and 0.9 (0 when none is defined). Give it to every
     * matrix of one report so that one colour means one value in all of them.
     */
    public static double colourScaleLower(List<double[][]> matrices) {
        double min = Double.POSITIVE_INFINITY;
        for (double[][] m : matrices) {
            for (double[] row : m) {
                for (double v : row) {
                    if (Numbers.isDefined(v)) {
                        min = Math.min(min, v);
                    }
                }
            }
        }
        return Double.isInfinite(min) ? 0 : Math.max(0, Math.min(0.9, Math.floor(min * 10) / 10));
    }

    /**
     * As {@link #agreementMatrix(List, List, double[][], String, int, int)}, with the colour scale
     * running from {@code scaleLower} to 1 ({@link #colourScaleLower}); NaN: from this matrix's
     * own lowest value. Values below {@code scaleLower} take its colour.
     */
    public static byte[] agreementMatrix(List<String> readers, List<String> centres, double[][] meanDice,
                                         double scaleLower, String title, int widthPx, int heightPx) {
        Png.checkSize(widthPx, heightPx);
        int n = readers.size();
        if (n == 0 || centres.size() != n || meanDice.length != n) {
            throw new IllegalArgumentException("need one centre and one matrix row per reader (" + n + " readers)");
        }
        for (double[] row : meanDice) {
            if (row.length != n) {
                throw new IllegalArgumentException("agreement matrix must be square " + n + "x" + n);
            }
        }
        Integer[] order = new Integer[n];
        for (int i = 0; i < n; i++) {
            order[i] = i;
        }
        Arrays.sort(order, Comparator.<Integer, String>comparing(centres::get).thenComparing(readers::get).thenComparing(i -> i));
        String[] names = new String[n];
        String[] blockOf = new String[n];
        for (int i = 0; i < n; i++) {
            names[i] = readers.get(order[i]);
            blockOf[i] = centres.get(order[i]);
        }
        double[][] xyz = new double[3][n * n];
        double min = Double.POSITIVE_INFINITY;
        boolean anyUndefined = false;
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                int k = a * n + b;
                double v = meanDice[order[a]][order[b]];
                xyz[0][k] = a;
                xyz[1][k] = b;
                xyz[2][k] = v;
                if (Numbers.isDefined(v)) {
                    min = Math.min(min, v);
                } else {
                    anyUndefined = true;
                }
            }
        }
        double lower = Numbers.isDefined(scaleLower) ? Math.max(0, Math.min(0.9, scaleLower))
            : Double.isInfinite(min) ? 0 : Math.max(0, Math.min(0.9, Math.floor(min * 10) / 10));
        DefaultXYZDataset data = new DefaultXYZDataset();
        data.addSeries("mean Dice", xyz);
        SequentialScale scale = new SequentialScale(lower, 1.0);
        XYBlockRenderer renderer = new XYBlockRenderer();
        renderer.setPaintScale(scale);
        renderer.setBlockWidth(1.0);
        renderer.setBlockHeight(1.0);
        SymbolAxis x = new SymbolAxis("Reader (grouped by centre)", names);
        SymbolAxis y = new SymbolAxis("Reader (grouped by centre)", names);
        for (SymbolAxis ax : List.of(x, y)) {
            ax.setGridBandsVisible(false);
            ax.setRange(-0.5, n - 0.5);
            ax.setAutoRange(false);
        }
        x.setVerticalTickLabels(true);
        y.setInverted(true);
        XYPlot plot = new XYPlot(data, x, y, renderer);
        plot.setDomainGridlinesVisible(false);
        plot.setRangeGridlinesVisible(false);
        plot.setBackgroundPaint(Color.WHITE);
        // centre names on the top and right edges, centred on their blocks
        List<double[]> blocks = new ArrayList<>();
        List<String> blockNames = new ArrayList<>();
        for (int i = 0; i < n; ) {
            int j = i;
            while (j < n && blockOf[j].equals(blockOf[i])) {
                j++;
            }
            blocks.add(new double[] {i - 0.5, j - 0.5});
            blockNames.add(blockOf[i]);
            i = j;
        }
        BlockAxis top = new BlockAxis("Centre", blocks, blockNames, n);
        BlockAxis right = new BlockAxis("Centre", blocks, blockNames, n);
        right.setInverted(true);
        plot.setDomainAxis(1, top);
        plot.setDomainAxisLocation(1, AxisLocation.TOP_OR_LEFT);
        plot.setRangeAxis(1, right);
        plot.setRangeAxisLocation(1, AxisLocation.BOTTOM_OR_RIGHT);
        BasicStroke separator = new BasicStroke(2.5f);
        for (int b = 1; b < blocks.size(); b++) {
            double at = blocks.get(b)[0];
            ValueMarker vx = new ValueMarker(at, Palette.INK, separator);
            ValueMarker vy = new ValueMarker(at, Palette.INK, separator);
            plot.addDomainMarker(vx, Layer.FOREGROUND);
            plot.addRangeMarker(vy, Layer.FOREGROUND);
        }
        if (n <= MAX_ANNOTATED_READERS) {
            Font cellFont = new Font(Font.SANS_SERIF, Font.PLAIN, n <= 8 ? 12 : 10);
            for (int k = 0; k < n * n; k++) {
                double v = xyz[2][k];
                String text = Numbers.isDefined(v) ? String.format(Locale.ROOT, "%.2f", v) : "n/a";
                XYTextAnnotation t = new XYTextAnnotation(text, xyz[0][k], xyz[1][k]);
                t.setFont(cellFont);
                double tone = Numbers.isDefined(v) ? Math.max(0, (v - lower) / (1.0 - lower)) : 0;
                t.setPaint(tone > 0.55 ? Color.WHITE : Palette.INK);
                if (!Numbers.isDefined(v)) {
                    t.setBackgroundPaint(Color.WHITE);
                }
                plot.addAnnotation(t, false);
            }
        }
        JFreeChart chart = chart(title, plot, false);
        NumberAxis legendAxis = new NumberAxis("Mean Dice (unitless)");
        legendAxis.setRange(lower, 1.0);
        legendAxis.setTickUnit(new org.jfree.chart.axis.NumberTickUnit(1.0 - lower <= 0.3 ? 0.05 : 0.1));
        styleValueAxis(legendAxis);
        PaintScaleLegend legend = new PaintScaleLegend(scale, legendAxis);
        legend.setPosition(RectangleEdge.RIGHT);
        legend.setAxisLocation(AxisLocation.BOTTOM_OR_RIGHT);
        legend.setStripWidth(14);
        legend.setSubdivisionCount(128);
        legend.setMargin(new RectangleInsets(10, 12, 10, 4));
        legend.setBackgroundPaint(Color.WHITE);
        chart.addSubtitle(legend);
        if (anyUndefined) {
            note(chart, "Hatched cells: undefined (the two readers share no case).");
        }
        return render(chart, widthPx, heightPx);
    }

    /** A linear sequential paint scale; NaN and infinities get a hatch pattern. */
    static final class SequentialScale implements PaintScale {
        private final double lower;
        private final double upper;
        private final transient Paint undefined;

        SequentialScale(double lower, double upper) {
            this.lower = lower;
            this.upper = upper;
            this.undefined = hatch();
        }

        @Override
        public double getLowerBound() {
            return lower;
        }

        @Override
        public double getUpperBound() {
            return upper;
        }

        @Override
        public Paint getPaint(double value) {
            if (!Numbers.isDefined(value)) {
                return undefined;
            }
            return Palette.sequential(upper > lower ? Math.max(0, Math.min(1, (value - lower) / (upper - lower))) : 1.0);
        }
    }

    static TexturePaint hatch() {
        return hatch(new Color(0x8A8F99), 2);
    }

    /** Diagonal stripes of the colour on white, {@code stripe} of every 8 pixels wide. */
    static TexturePaint hatch(Color colour, int stripe) {
        BufferedImage tile = new BufferedImage(8, 8, BufferedImage.TYPE_INT_RGB);
        for (int yy = 0; yy < 8; yy++) {
            for (int xx = 0; xx < 8; xx++) {
                boolean line = Math.floorMod(xx - yy, 8) < stripe;
                tile.setRGB(xx, yy, line ? colour.getRGB() & 0xFFFFFF : 0xFFFFFF);
            }
        }
        return new TexturePaint(tile, new Rectangle2D.Double(0, 0, 8, 8));
    }

    /** An axis showing named blocks (centres) at their midpoints, with the primary axis's range. */
    static final class BlockAxis extends NumberAxis {
        private static final long serialVersionUID = 1L;
        private final transient List<double[]> blocks;
        private final List<String> names;

        BlockAxis(String label, List<double[]> blocks, List<String> names, int n) {
            super(label);
            this.blocks = blocks;
            this.names = names;
            setRange(-0.5, n - 0.5);
            setAutoRange(false);
            setTickMarksVisible(false);
            styleValueAxis(this);
            setTickLabelFont(LABEL_FONT.deriveFont(Font.BOLD));
        }

        @Override
        @SuppressWarnings("rawtypes")
        public List refreshTicks(Graphics2D g2, AxisState state, Rectangle2D dataArea, RectangleEdge edge) {
            List<NumberTick> ticks = new ArrayList<>();
            boolean vertical = RectangleEdge.isLeftOrRight(edge);
            for (int b = 0; b < blocks.size(); b++) {
                double mid = (blocks.get(b)[0] + blocks.get(b)[1]) / 2;
                TextAnchor anchor = vertical
                    ? (edge == RectangleEdge.RIGHT ? TextAnchor.CENTER_LEFT : TextAnchor.CENTER_RIGHT)
                    : (edge == RectangleEdge.TOP ? TextAnchor.BOTTOM_CENTER : TextAnchor.TOP_CENTER);
                ticks.add(new NumberTick(mid, names.get(b), anchor, anchor, 0.0));
            }
            return ticks;
        }
    }

    // ------------------------------------------------------------------ interval (forest) plot

    /**
     * A forest plot: one row per name (top to bottom in the given order), its estimate as a point
     * and its interval as a horizontal bar with caps, a dashed vertical reference line (e.g. 0 mm
     * or a ratio of 1) and, optionally, a shaded band of ± {@code bandHalfWidth} around the
     * reference (the smallest difference that matters). Rows whose estimate is NaN are labelled
     * "not estimable" instead of drawn; an interval with a NaN end is drawn as the point alone.
     *
     * @param axisLabel the measured quantity with its unit, e.g. "Signed surface distance (mm)"
     * @param bandHalfWidth {@code null} for no band
     */
    public static byte[] intervalPlot(List<String> names, double[] estimate, double[] lo, double[] hi,
                                      String axisLabel, double referenceLine, Double bandHalfWidth,
                                      String title, int widthPx, int heightPx) {
        return intervalPlot(names, estimate, lo, hi, axisLabel, referenceLine, bandHalfWidth, "intervals", title,
            widthPx, heightPx);
    }

    /**
     * As {@link #intervalPlot(List, double[], double[], double[], String, double, Double, String, int, int)},
     * with the note under the chart saying what the bars are, e.g. "95% case-bootstrap percentile
     * intervals (2000 resamples)".
     */
    public static byte[] intervalPlot(List<String> names, double[] estimate, double[] lo, double[] hi,
                                      String axisLabel, double referenceLine, Double bandHalfWidth,
                                      String intervalWords, String title, int widthPx, int heightPx) {
        Png.checkSize(widthPx, heightPx);
        int n = names.size();
        if (n == 0 || estimate.length != n || lo.length != n || hi.length != n) {
            throw new IllegalArgumentException("need one estimate and interval per name (" + n + " names)");
        }
        XIntervalSeries series = new XIntervalSeries("estimate with interval", false, true);
        double min = referenceLine;
        double max = referenceLine;
        if (bandHalfWidth != null && Numbers.isDefined(bandHalfWidth)) {
            min = Math.min(min, referenceLine - Math.abs(bandHalfWidth));
            max = Math.max(max, referenceLine + Math.abs(bandHalfWidth));
        }
        List<Integer> notEstimable = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            double e = estimate[i];
            if (!Numbers.isDefined(e)) {
                notEstimable.add(i);
                continue;
            }
            double l = Numbers.isDefined(lo[i]) ? lo[i] : e;
            double h = Numbers.isDefined(hi[i]) ? hi[i] : e;
            series.add(e, Math.min(l, e), Math.max(h, e), i);
            min = Math.min(min, Math.min(l, e));
            max = Math.max(max, Math.max(h, e));
        }
        XIntervalSeriesCollection data = new XIntervalSeriesCollection();
        data.addSeries(series);
        NumberAxis x = new NumberAxis(axisLabel);
        double pad = (max - min) > 0 ? (max - min) * 0.08 : 1.0;
        x.setRange(min - pad, max + pad);
        styleValueAxis(x);
        SymbolAxis y = new SymbolAxis(null, names.toArray(new String[0]));
        y.setRange(-0.6, n - 0.4);
        y.setAutoRange(false);
        y.setInverted(true);
        y.setGridBandsVisible(true);
        y.setGridBandPaint(new Color(0xF3F0E9));
        y.setGridBandAlternatePaint(Color.WHITE);
        styleValueAxis(y);
        XYErrorRenderer renderer = new XYErrorRenderer();
        renderer.setDrawXError(true);
        renderer.setDrawYError(false);
        renderer.setDefaultLinesVisible(false);
        renderer.setDefaultShapesVisible(true);
        renderer.setSeriesShape(0, new Rectangle2D.Double(-5, -5, 10, 10));
        renderer.setSeriesPaint(0, Palette.CALM);
        renderer.setErrorPaint(Palette.INK);
        renderer.setErrorStroke(new BasicStroke(2f));
        renderer.setCapLength(8);
        XYPlot plot = new XYPlot(data, x, y, renderer);
        plot.setOrientation(PlotOrientation.VERTICAL);
        stylePlot(plot);
        plot.setRangeGridlinesVisible(false);
        if (bandHalfWidth != null && Numbers.isDefined(bandHalfWidth) && bandHalfWidth != 0) {
            double hw = Math.abs(bandHalfWidth);
            IntervalMarker band = new IntervalMarker(referenceLine - hw, referenceLine + hw,
                new Color(0xE4EEF3), new BasicStroke(0f), null, null, 1f);
            band.setLabel("\u00B1 " + Numbers.format(hw) + " (smallest difference that matters)");
            band.setLabelFont(TICK_FONT);
            band.setLabelPaint(Palette.MUTED);
            band.setLabelBackgroundColor(new Color(255, 255, 255, 0));
            band.setLabelAnchor(RectangleAnchor.BOTTOM);
            band.setLabelTextAnchor(TextAnchor.BOTTOM_CENTER);
            plot.addDomainMarker(band, Layer.BACKGROUND);
        }
        ValueMarker ref = new ValueMarker(referenceLine, Palette.MUTED,
            new BasicStroke(1.5f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_MITER, 10f, new float[] {6f, 4f}, 0f));
        ref.setLabel("reference " + Numbers.format(referenceLine));
        ref.setLabelFont(TICK_FONT);
        ref.setLabelPaint(Palette.MUTED);
        ref.setLabelBackgroundColor(new Color(255, 255, 255, 0));
        ref.setLabelAnchor(RectangleAnchor.TOP_RIGHT);
        ref.setLabelTextAnchor(TextAnchor.TOP_LEFT);
        plot.addDomainMarker(ref, Layer.BACKGROUND);
        for (int i : notEstimable) {
            XYTextAnnotation t = new XYTextAnnotation("not estimable", referenceLine, i);
            t.setFont(NOTE_FONT);
            t.setPaint(Palette.MUTED);
            t.setBackgroundPaint(Color.WHITE);
            plot.addAnnotation(t, false);
        }
        JFreeChart chart = chart(title, plot, false);
        note(chart, "Points: estimates; bars: " + intervalWords + "; dashed line: reference"
            + (bandHalfWidth != null && Numbers.isDefined(bandHalfWidth) && bandHalfWidth != 0 ? "; shaded band: smallest difference that matters." : "."));
        return render(chart, widthPx, heightPx);
    }

    // ------------------------------------------------------------------ scatter

    /**
     * A scatter plot of one point per name (e.g. per reader: sensitivity against specificity),
     * coloured and shaped by group (e.g. centre; groups in sorted order, explained in the legend),
     * each point labelled with its name. Points with a NaN coordinate are left out and named in a
     * note.
     */
    public static byte[] scatter(List<String> names, List<String> groups, double[] x, double[] y,
                                 String xLabel, String yLabel, String title, int widthPx, int heightPx) {
        return scatter(names, groups, x, y, xLabel, yLabel, false, title, widthPx, heightPx);
    }

    /**
     * As {@link #scatter(List, List, double[], double[], String, String, String, int, int)}; with
     * {@code proportions} both axes are proportions (e.g. sensitivity and specificity): ticks at a
     * round step (1, 2 or 5 thousandths or hundredths, 0.1, 0.2 or 0.25; at most about six per axis) and only within
     * [0, 1]; the plotted range stays within [0, 1] except for a margin that keeps points and their
     * labels at 1 inside the picture.
     */
    public static byte[] scatter(List<String> names, List<String> groups, double[] x, double[] y,
                                 String xLabel, String yLabel, boolean proportions, String title, int widthPx,
                                 int heightPx) {
        Png.checkSize(widthPx, heightPx);
        int n = names.size();
        if (groups.size() != n || x.length != n || y.length != n) {
            throw new IllegalArgumentException("need one group, x and y per name (" + n + " names)");
        }
        Map<String, List<Integer>> byGroup = new TreeMap<>();
        List<String> left = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            if (!Numbers.isDefined(x[i]) || !Numbers.isDefined(y[i])) {
                left.add(names.get(i));
                continue;
            }
            byGroup.computeIfAbsent(groups.get(i), g -> new ArrayList<>()).add(i);
        }
        XYSeriesCollection data = new XYSeriesCollection();
        List<List<String>> labels = new ArrayList<>();
        for (Map.Entry<String, List<Integer>> e : byGroup.entrySet()) {
            XYSeries s = new XYSeries(e.getKey(), false, true);
            List<String> l = new ArrayList<>();
            for (int i : e.getValue()) {
                s.add(x[i], y[i]);
                l.add(names.get(i));
            }
            data.addSeries(s);
            labels.add(l);
        }
        XYLineAndShapeRenderer renderer = new XYLineAndShapeRenderer(false, true);
        Shape[] shapes = DefaultDrawingSupplier.createStandardSeriesShapes();
        for (int s = 0; s < labels.size(); s++) {
            renderer.setSeriesPaint(s, Palette.category(s));
            renderer.setSeriesShape(s, scale(shapes[s % shapes.length], 1.6));
        }
        renderer.setDefaultItemLabelGenerator((dataset, series, item) -> labels.get(series).get(item));
        renderer.setDefaultItemLabelsVisible(true);
        renderer.setDefaultItemLabelFont(TICK_FONT);
        renderer.setDefaultItemLabelPaint(Palette.INK);
        renderer.setDefaultPositiveItemLabelPosition(new ItemLabelPosition(ItemLabelAnchor.OUTSIDE12, TextAnchor.BOTTOM_CENTER));
        renderer.setDefaultNegativeItemLabelPosition(new ItemLabelPosition(ItemLabelAnchor.OUTSIDE12, TextAnchor.BOTTOM_CENTER));
        NumberAxis xa = proportions ? new ProportionAxis(xLabel) : new NumberAxis(xLabel);
        NumberAxis ya = proportions ? new ProportionAxis(yLabel) : new NumberAxis(yLabel);
        for (NumberAxis a : List.of(xa, ya)) {
            a.setAutoRangeIncludesZero(false);
            a.setLowerMargin(0.08);
            a.setUpperMargin(0.08);
            styleValueAxis(a);
        }
        ya.setUpperMargin(0.15); // room for the labels above the points
        if (proportions) {
            proportionRange(xa, x, 0.04);
            proportionRange(ya, y, 0.12);
        }
        XYPlot plot = new XYPlot(data, xa, ya, renderer);
        stylePlot(plot);
        JFreeChart chart = chart(title, plot, true);
        if (!left.isEmpty()) {
            note(chart, "Not shown (undefined value): " + String.join(", ", left) + ".");
        }
        return render(chart, widthPx, heightPx);
    }

    /** The step of the ticks on a proportion axis spanning {@code span}: about six ticks at most. */
    static double proportionTickUnit(double span) {
        for (double u : new double[] {0.001, 0.002, 0.005, 0.01, 0.02, 0.05, 0.1, 0.2, 0.25}) {
            if (span / u <= 6) {
                return u;
            }
        }
        return 0.25;
    }

    /**
     * Fixes a proportion axis's range from the defined values: whole tick steps around them within
     * [0, 1], plus {@code room} (a fraction of the span) beyond them for the markers and labels.
     */
    static void proportionRange(NumberAxis a, double[] values, double room) {
        double min = Double.POSITIVE_INFINITY;
        double max = Double.NEGATIVE_INFINITY;
        for (double v : values) {
            if (Numbers.isDefined(v)) {
                min = Math.min(min, Math.max(0, Math.min(1, v)));
                max = Math.max(max, Math.max(0, Math.min(1, v)));
            }
        }
        if (min > max) {
            min = 0;
            max = 1;
        }
        double unit = proportionTickUnit(Math.max(max - min, 0.01));
        double lower = Math.max(0, Math.floor((min - unit / 2) / unit) * unit);
        double upper = Math.min(1, Math.ceil((max + unit / 4) / unit) * unit);
        if (upper - lower < unit) {
            lower = Math.max(0, upper - unit);
        }
        double span = upper - lower;
        a.setAutoRange(false);
        a.setRange(lower > 0 ? lower : -room * span / 3, upper + (upper >= 1 ? room * span : 0));
        a.setTickUnit(new org.jfree.chart.axis.NumberTickUnit(unit,
            new DecimalFormat(unit < 0.01 ? "0.000" : unit < 0.1 ? "0.00" : "0.0",
                DecimalFormatSymbols.getInstance(Locale.ROOT))));
    }

    /** A number axis for a proportion: no tick is drawn outside [0, 1], whatever the range's margins. */
    static final class ProportionAxis extends NumberAxis {
        private static final long serialVersionUID = 1L;

        ProportionAxis(String label) {
            super(label);
        }

        @Override
        @SuppressWarnings({"rawtypes", "unchecked"})
        public List refreshTicks(Graphics2D g2, AxisState state, Rectangle2D dataArea, RectangleEdge edge) {
            List ticks = new ArrayList(super.refreshTicks(g2, state, dataArea, edge));
            ticks.removeIf(t -> t instanceof NumberTick n && (n.getValue() > 1 + 1e-9 || n.getValue() < -1e-9));
            return ticks;
        }
    }

    // ------------------------------------------------------------------ stacked shares

    /** One stacked bar of shares of the total (e.g. variance components of one label). */
    public static byte[] stackedShares(List<String> components, double[] values, String title, int widthPx, int heightPx) {
        double[][] v = new double[1][];
        v[0] = values;
        return stackedShares(List.of("all"), components, v, title, widthPx, heightPx);
    }

    /**
     * Horizontal stacked bars, one per category (e.g. label), each split into the shares of its
     * total taken by the components (e.g. within-reader, within-centre, between-centre variance),
     * in per cent, with the share printed in segments of at least 5 %. Negative or undefined
     * components are drawn as 0 and named in a note; a category whose total is 0 is drawn empty
     * and named in the note.
     *
     * @param values {@code values[category][component]}, in any common unit (shares are unitless)
     */
    public static byte[] stackedShares(List<String> categories, List<String> components, double[][] values,
                                       String title, int widthPx, int heightPx) {
        Png.checkSize(widthPx, heightPx);
        if (categories.isEmpty() || components.isEmpty() || values.length != categories.size()) {
            throw new IllegalArgumentException("need one row of values per category");
        }
        DefaultCategoryDataset data = new DefaultCategoryDataset();
        List<String> notes = new ArrayList<>();
        for (int c = 0; c < categories.size(); c++) {
            if (values[c].length != components.size()) {
                throw new IllegalArgumentException("need one value per component for " + categories.get(c));
            }
            double total = 0;
            for (int k = 0; k < components.size(); k++) {
                double v = values[c][k];
                if (Numbers.isDefined(v) && v > 0) {
                    total += v;
                } else if (!(Numbers.isDefined(v) && v == 0)) {
                    notes.add(components.get(k) + (categories.size() > 1 ? " (" + categories.get(c) + ")" : ""));
                }
            }
            if (total == 0) {
                notes.add("total of " + categories.get(c) + " is 0");
            }
            for (int k = 0; k < components.size(); k++) {
                double v = values[c][k];
                double share = total > 0 && Numbers.isDefined(v) && v > 0 ? 100.0 * v / total : 0.0;
                data.addValue(share, components.get(k), categories.get(c));
            }
        }
        StackedBarRenderer renderer = new StackedBarRenderer();
        renderer.setBarPainter(new StandardBarPainter());
        renderer.setShadowVisible(false);
        renderer.setDrawBarOutline(true);
        renderer.setMaximumBarWidth(0.5);
        for (int k = 0; k < components.size(); k++) {
            renderer.setSeriesPaint(k, Palette.category(k));
            renderer.setSeriesOutlinePaint(k, Color.WHITE);
            renderer.setSeriesOutlineStroke(k, new BasicStroke(1f));
        }
        DecimalFormat pct = new DecimalFormat("0", DecimalFormatSymbols.getInstance(Locale.ROOT));
        renderer.setDefaultItemLabelGenerator(new StandardCategoryItemLabelGenerator("{2}", pct) {
            private static final long serialVersionUID = 1L;

            @Override
            public String generateLabel(CategoryDataset dataset, int row, int column) {
                java.lang.Number v = dataset.getValue(row, column);
                return v == null || v.doubleValue() < 5 ? null : pct.format(v.doubleValue()) + " %";
            }
        });
        renderer.setDefaultItemLabelsVisible(true);
        renderer.setDefaultItemLabelFont(LABEL_FONT.deriveFont(Font.BOLD));
        renderer.setDefaultItemLabelPaint(Color.WHITE);
        renderer.setDefaultPositiveItemLabelPosition(new ItemLabelPosition(ItemLabelAnchor.CENTER, TextAnchor.CENTER));
        CategoryAxis ca = new CategoryAxis(categories.size() > 1 ? "Structure" : null);
        ca.setTickLabelsVisible(categories.size() > 1);
        styleCategoryAxis(ca);
        NumberAxis va = new NumberAxis("Share of the total (%)");
        va.setRange(0, 100);
        styleValueAxis(va);
        CategoryPlot plot = new CategoryPlot(data, ca, va, renderer);
        plot.setOrientation(PlotOrientation.HORIZONTAL);
        stylePlot(plot);
        plot.setDomainGridlinesVisible(false);
        JFreeChart chart = chart(title, plot, true);
        if (!notes.isEmpty()) {
            note(chart, "Drawn as 0 (negative, undefined or empty): " + String.join(", ", notes) + ".");
        }
        return render(chart, widthPx, heightPx);
    }

    // ------------------------------------------------------------------ ranked bars

    /**
     * Bars ranked from the largest value down (e.g. cases by disagreement, 1 − median Dice), with
     * the threshold drawn as a labelled line; bars above the threshold are drawn in the warning
     * colour (the line itself shows which bars exceed it, so colour is not the only cue). Names are
     * printed under the bars when there are at most {@value #MAX_NAMED_BARS}. NaN values are left
     * out and counted in a note; ties are ordered by name.
     */
    public static byte[] rankedBars(List<String> names, double[] values, double threshold, String axisLabel,
                                    String title, int widthPx, int heightPx) {
        return rankedBars(names, values, null, threshold, axisLabel, title, widthPx, heightPx);
    }

    /**
     * As {@link #rankedBars(List, double[], double, String, String, int, int)}, with a state per
     * name ({@code null} for all {@link StructureCase#DRAWN}): a name whose state is
     * {@link StructureCase#ABSENT} (no reader drew the structure) gets no bar — its value would be
     * a convention, not agreement — but a mark "absent" at the right end of the axis and a note
     * naming it; a name whose state is {@link StructureCase#PARTLY_DRAWN} (some readers drew
     * nothing) is drawn hatched in its colour, explained in the legend.
     */
    public static byte[] rankedBars(List<String> names, double[] values, List<String> states, double threshold,
                                    String axisLabel, String title, int widthPx, int heightPx) {
        Png.checkSize(widthPx, heightPx);
        int n = names.size();
        if (values.length != n || (states != null && states.size() != n)) {
            throw new IllegalArgumentException("need one value (and state) per name (" + n + " names)");
        }
        List<Integer> idx = new ArrayList<>();
        List<String> absent = new ArrayList<>();
        int undefined = 0;
        for (int i = 0; i < n; i++) {
            String state = states == null ? StructureCase.DRAWN : states.get(i);
            if (StructureCase.ABSENT.equals(state)) {
                absent.add(names.get(i));
            } else if (Numbers.isDefined(values[i])) {
                idx.add(i);
            } else {
                undefined++;
            }
        }
        java.util.Collections.sort(absent);
        idx.sort(Comparator.<Integer>comparingDouble(i -> -values[i]).thenComparing(names::get).thenComparing(i -> i));
        DefaultCategoryDataset data = new DefaultCategoryDataset();
        boolean[] above = new boolean[idx.size()];
        boolean[] partly = new boolean[idx.size()];
        int aboveCount = 0;
        int partlyCount = 0;
        for (int r = 0; r < idx.size(); r++) {
            int i = idx.get(r);
            // unique column keys even for repeated names
            data.addValue(values[i], "value", new RankedKey(r, names.get(i)));
            above[r] = values[i] > threshold;
            partly[r] = states != null && StructureCase.PARTLY_DRAWN.equals(states.get(i));
            aboveCount += above[r] ? 1 : 0;
            partlyCount += partly[r] ? 1 : 0;
        }
        List<RankedKey> absentKeys = new ArrayList<>();
        for (int k = 0; k < absent.size(); k++) {
            RankedKey key = new RankedKey(idx.size() + k, absent.get(k));
            absentKeys.add(key);
            data.addValue(null, "value", key); // a place on the axis, no bar
        }
        Paint warnHatch = hatch(Palette.WARN, 4);
        Paint calmHatch = hatch(Palette.CALM, 4);
        BarRenderer renderer = new BarRenderer() {
            private static final long serialVersionUID = 1L;

            @Override
            public Paint getItemPaint(int row, int column) {
                if (column >= above.length) {
                    return Palette.MUTED;
                }
                return partly[column] ? (above[column] ? warnHatch : calmHatch) : above[column] ? Palette.WARN : Palette.CALM;
            }
        };
        renderer.setBarPainter(new StandardBarPainter());
        renderer.setShadowVisible(false);
        renderer.setDrawBarOutline(false);
        renderer.setItemMargin(0);
        renderer.setMaximumBarWidth(0.08);
        CategoryAxis ca = new CategoryAxis(idx.size() + absent.size() <= MAX_NAMED_BARS
            ? "Case (ranked)" : "Cases ranked (" + idx.size() + "; names in the table)");
        ca.setTickLabelsVisible(idx.size() + absent.size() <= MAX_NAMED_BARS);
        ca.setCategoryLabelPositions(CategoryLabelPositions.UP_90);
        ca.setCategoryMargin(0.15);
        styleCategoryAxis(ca);
        NumberAxis va = new NumberAxis(axisLabel);
        styleValueAxis(va);
        va.setAutoRangeIncludesZero(true);
        double top = threshold;
        for (int i : idx) {
            top = Math.max(top, values[i]);
        }
        double upper = top > 0 ? top * 1.08 : 1.0;
        va.setRange(Math.min(0, threshold), upper);
        CategoryPlot plot = new CategoryPlot(data, ca, va, renderer);
        for (RankedKey key : absentKeys) {
            // the mark of an absent case: the word, upright from the axis, where its bar would be
            org.jfree.chart.annotations.CategoryTextAnnotation mark =
                new org.jfree.chart.annotations.CategoryTextAnnotation("\u2205 absent", key, upper * 0.02);
            mark.setFont(NOTE_FONT.deriveFont(Font.BOLD));
            mark.setPaint(Palette.MUTED);
            mark.setTextAnchor(TextAnchor.CENTER_LEFT);
            mark.setRotationAnchor(TextAnchor.CENTER_LEFT);
            mark.setRotationAngle(-Math.PI / 2);
            plot.addAnnotation(mark);
        }
        stylePlot(plot);
        plot.setDomainGridlinesVisible(false);
        ValueMarker line = new ValueMarker(threshold, Palette.INK,
            new BasicStroke(2f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_MITER, 10f, new float[] {8f, 4f}, 0f));
        line.setLabel("threshold " + Numbers.format(threshold));
        line.setLabelFont(LABEL_FONT);
        line.setLabelPaint(Palette.INK);
        line.setLabelBackgroundColor(Color.WHITE);
        line.setLabelAnchor(RectangleAnchor.TOP_RIGHT);
        line.setLabelTextAnchor(TextAnchor.BOTTOM_RIGHT);
        plot.addRangeMarker(line, Layer.FOREGROUND);
        LegendItemCollection legend = new LegendItemCollection();
        Shape box = new Rectangle2D.Double(-6, -6, 12, 12);
        legend.add(new LegendItem("above the threshold (" + aboveCount + ")", null, null, null, box, Palette.WARN));
        legend.add(new LegendItem("at or below (" + (idx.size() - aboveCount) + ")", null, null, null, box, Palette.CALM));
        if (partlyCount > 0) {
            legend.add(new LegendItem("hatched: some readers drew nothing (" + partlyCount + ")", null, null, null, box,
                hatch(Palette.INK, 3)));
        }
        if (!absent.isEmpty()) {
            legend.add(new LegendItem("\u2205 absent: no reader drew it (" + absent.size() + ")", null, null, null,
                new Rectangle2D.Double(-6, -1, 12, 2), Palette.MUTED));
        }
        plot.setFixedLegendItems(legend);
        JFreeChart chart = chart(title, plot, true);
        if (!absent.isEmpty()) {
            note(chart, "No bar for " + String.join(", ", absent) + ": no reader drew the structure there "
                + "(absent, which is not agreement).");
        }
        if (undefined > 0) {
            note(chart, undefined + " not shown (undefined value).");
        }
        return render(chart, widthPx, heightPx);
    }

    /** A category key: rank and name; shown as the name. */
    record RankedKey(int rank, String name) implements Comparable<RankedKey> {
        @Override
        public int compareTo(RankedKey o) {
            return Integer.compare(rank, o.rank);
        }

        @Override
        public String toString() {
            return name;
        }
    }

    // ------------------------------------------------------------------ shared style

    private static Shape scale(Shape s, double f) {
        return java.awt.geom.AffineTransform.getScaleInstance(f, f).createTransformedShape(s);
    }

    static JFreeChart chart(String title, Plot plot, boolean legend) {
        JFreeChart chart = new JFreeChart(title, TITLE_FONT, plot, legend);
        chart.setBackgroundPaint(Color.WHITE);
        chart.setAntiAlias(true);
        chart.setTextAntiAlias(true);
        chart.getTitle().setPaint(Palette.INK);
        chart.getTitle().setMargin(new RectangleInsets(8, 8, 6, 8));
        chart.setPadding(new RectangleInsets(6, 8, 6, 12));
        LegendTitle lt = chart.getLegend();
        if (lt != null) {
            lt.setItemFont(LABEL_FONT);
            lt.setItemPaint(Palette.INK);
            lt.setFrame(BlockBorder.NONE);
            lt.setBackgroundPaint(Color.WHITE);
            lt.setPosition(RectangleEdge.BOTTOM);
        }
        return chart;
    }

    static void note(JFreeChart chart, String text) {
        TextTitle t = new TextTitle(text, NOTE_FONT);
        t.setPaint(Palette.MUTED);
        t.setPosition(RectangleEdge.BOTTOM);
        t.setMargin(new RectangleInsets(4, 4, 2, 4));
        chart.addSubtitle(t);
    }

    static void stylePlot(Plot plot) {
        plot.setBackgroundPaint(Palette.PLOT_BACKGROUND);
        plot.setOutlinePaint(Palette.GRID);
        if (plot instanceof XYPlot xy) {
            xy.setDomainGridlinePaint(Palette.GRID);
            xy.setRangeGridlinePaint(Palette.GRID);
            xy.setDomainGridlineStroke(new BasicStroke(1f));
            xy.setRangeGridlineStroke(new BasicStroke(1f));
        } else if (plot instanceof CategoryPlot cp) {
            cp.setRangeGridlinePaint(Palette.GRID);
            cp.setRangeGridlineStroke(new BasicStroke(1f));
        }
    }

    static void styleValueAxis(ValueAxis a) {
        a.setLabelFont(LABEL_FONT);
        a.setLabelPaint(Palette.INK);
        a.setTickLabelFont(TICK_FONT);
        a.setTickLabelPaint(Palette.INK);
        a.setAxisLinePaint(Palette.MUTED);
        a.setTickMarkPaint(Palette.MUTED);
    }

    static void styleCategoryAxis(CategoryAxis a) {
        a.setLabelFont(LABEL_FONT);
        a.setLabelPaint(Palette.INK);
        a.setTickLabelFont(TICK_FONT);
        a.setTickLabelPaint(Palette.INK);
        a.setAxisLinePaint(Palette.MUTED);
    }

    static byte[] render(JFreeChart chart, int widthPx, int heightPx) {
        BufferedImage img = Png.newImage(widthPx, heightPx);
        Graphics2D g = Png.graphics(img, true);
        try {
            chart.draw(g, new Rectangle2D.Double(0, 0, widthPx, heightPx));
        } finally {
            g.dispose();
        }
        return Png.encode(img);
    }
}
