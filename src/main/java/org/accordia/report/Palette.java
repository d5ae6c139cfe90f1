package org.accordia.report;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Stroke;

/**
 * The colours and line styles of every chart and overlay picture.
 *
 * <p>Category colours are the eight colours proposed by Okabe and Ito ("Color Universal Design",
 * 2008), which stay distinguishable for the common forms of colour-vision deficiency; the yellow
 * is replaced by a dark grey-blue because yellow lines vanish on a white page. Where more than eight
 * categories are shown, colours repeat and a second cue (marker shape or line style) tells them
 * apart. The sequential scale for agreement runs from a pale cream (low) to a dark blue (high)
 * with monotonically decreasing lightness, so it reads in grey-scale print too.
 */
public final class Palette {
    private static final Color[] CATEGORY = {
        new Color(0x0072B2), // blue
        new Color(0xE69F00), // orange
        new Color(0x009E73), // bluish green
        new Color(0xCC79A7), // reddish purple
        new Color(0x56B4E9), // sky blue
        new Color(0xD55E00), // vermillion
        new Color(0x3A4A5C), // dark grey-blue (in place of yellow)
        new Color(0x8C6D1F), // ochre
    };

    /** Page and text colours. */
    public static final Color INK = new Color(0x1F2430);
    public static final Color MUTED = new Color(0x5B6270);
    public static final Color GRID = new Color(0xDDD8CE);
    public static final Color PLOT_BACKGROUND = new Color(0xFBFAF7);
    /** For "above the threshold" and other warnings. */
    public static final Color WARN = new Color(0xD55E00);
    /** For "within the threshold" and neutral data. */
    public static final Color CALM = new Color(0x0072B2);

    /** Stops of the sequential scale, low to high. */
    private static final Color[] SEQUENTIAL = {
        new Color(0xFAF5E4), new Color(0xD3E4C4), new Color(0x8FC1A9), new Color(0x4A98A0),
        new Color(0x2A6A8F), new Color(0x1B3A66),
    };

    private Palette() {
    }

    /** The i-th category colour (repeats after eight). */
    public static Color category(int i) {
        return CATEGORY[Math.floorMod(i, CATEGORY.length)];
    }

    /** Number of distinct category colours. */
    public static int categoryCount() {
        return CATEGORY.length;
    }

    /** The sequential scale at {@code t} in [0, 1] (clamped), interpolated in RGB between stops. */
    public static Color sequential(double t) {
        double c = Math.max(0, Math.min(1, t)) * (SEQUENTIAL.length - 1);
        int i = Math.min((int) Math.floor(c), SEQUENTIAL.length - 2);
        double f = c - i;
        Color a = SEQUENTIAL[i];
        Color b = SEQUENTIAL[i + 1];
        return new Color(
            (int) Math.round(a.getRed() + f * (b.getRed() - a.getRed())),
            (int) Math.round(a.getGreen() + f * (b.getGreen() - a.getGreen())),
            (int) Math.round(a.getBlue() + f * (b.getBlue() - a.getBlue())));
    }

    /**
     * The i-th line style: solid, dashed, dotted, dash-dot, long dash, dash-dot-dot (repeats after
     * six), of the given width.
     */
    public static Stroke lineStyle(int i, float width) {
        float w = Math.max(1f, width);
        float[][] dashes = {
            null,
            {4 * w, 2.5f * w},
            {1 * w, 1.8f * w},
            {5 * w, 2 * w, 1 * w, 2 * w},
            {8 * w, 3 * w},
            {5 * w, 2 * w, 1 * w, 2 * w, 1 * w, 2 * w},
        };
        float[] d = dashes[Math.floorMod(i, dashes.length)];
        return d == null
            ? new BasicStroke(w, BasicStroke.CAP_BUTT, BasicStroke.JOIN_MITER)
            : new BasicStroke(w, BasicStroke.CAP_BUTT, BasicStroke.JOIN_MITER, 10f, d, 0f);
    }

    /** Names of the line styles, in the order of {@link #lineStyle(int, float)}. */
    public static String lineStyleName(int i) {
        String[] names = {"solid", "dashed", "dotted", "dash-dot", "long dash", "dash-dot-dot"};
        return names[Math.floorMod(i, names.length)];
    }

    /** Number of distinct line styles. */
    public static int lineStyleCount() {
        return 6;
    }
}
