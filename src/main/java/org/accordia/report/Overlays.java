package org.accordia.report;

import ij.process.ByteProcessor;
import ij.process.FloatProcessor;
import ij.process.ImageProcessor;
import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.awt.FontMetrics;
import java.awt.Graphics2D;
import java.awt.geom.Line2D;
import java.awt.geom.Path2D;
import java.awt.image.BufferedImage;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.TreeSet;
import org.accordia.io.Geometry;

/**
 * Pictures of one slice with every reader's contour, for the cases the report shows.
 *
 * <p>{@link #render} draws:
 * <ul>
 *   <li>the background slice in grey, windowed to its 1st–99th percentile (nearest rank, NaN
 *       ignored) with ImageJ ({@code FloatProcessor.setMinAndMax}, conversion to 8 bits) and
 *       scaled bilinearly so that the longest side is at least {@value #MIN_LONGEST_SIDE_PX} px,
 *       respecting the in-plane pixel spacing {@code sx : sy} (a voxel of 0.7 × 1.4 mm is drawn
 *       twice as tall as wide); without a background, a dark grey field;</li>
 *   <li>each reader's contour as the boundary between inside and outside voxels (the edges between
 *       voxels, never a fill), in a colour per reader (the Okabe–Ito colour-blind-safe set, readers
 *       in sorted order) and a line style per centre (solid, dashed, dotted, dash-dot, ..., centres
 *       in sorted order), over a thin black halo so it shows on bright and dark tissue alike;</li>
 *   <li>the anatomical direction at the middle of each edge (R/L, A/P, S/I) when the geometry is
 *       given ({@link #edgeLabels}), the title, the orientation note, the pixel spacing and the
 *       scale, and a legend with one line sample per reader in its colour and its centre's style,
 *       plus the centre-to-style key.</li>
 * </ul>
 * The slice is shown in array order: voxel (0, 0) at the top left, x growing to the right, y
 * growing downwards; no anatomical flip is applied, and the edge letters say where each
 * direction lies.
 */
public final class Overlays {
    /** The longest side of the picture of the slice is at least this many pixels. */
    public static final int MIN_LONGEST_SIDE_PX = 384;
    /** ... and at most this many (large slices are scaled down). */
    public static final int MAX_LONGEST_SIDE_PX = 1024;
    /** Width of a contour line, in picture pixels. */
    public static final float CONTOUR_WIDTH_PX = 3f;

    private static final int MARGIN = 12;
    private static final Font TITLE = new Font(Font.SANS_SERIF, Font.BOLD, 15);
    private static final Font TEXT = new Font(Font.SANS_SERIF, Font.PLAIN, 12);
    private static final Font EDGE = new Font(Font.SANS_SERIF, Font.BOLD, 16);
    private static final Color NO_BACKGROUND = new Color(0x3C3C3C);

    /**
     * One reader's mask on the slice to show.
     *
     * @param sliceMask nx·ny booleans, x fastest
     */
    public record Contour(String reader, String centre, boolean[] sliceMask) {
    }

    /** Where the slice was placed in the picture (for tests and callers adding marks). */
    record Layout(int offsetX, int offsetY, int widthPx, int heightPx) {
        double x(double voxelX, int nx) {
            return offsetX + voxelX * widthPx / nx;
        }

        double y(double voxelY, int ny) {
            return offsetY + voxelY * heightPx / ny;
        }
    }

    private Overlays() {
    }

    /**
     * Renders one slice with the readers' contours as PNG bytes (see the class description).
     *
     * @param backgroundSlice nx·ny intensities (x fastest), or {@code null} for none
     * @param sx pixel spacing along x in mm (&gt; 0)
     * @param sy pixel spacing along y in mm (&gt; 0)
     * @param title e.g. "case-07 · liver · axial slice z = 23"
     */
    public static byte[] render(float[] backgroundSlice, int nx, int ny, double sx, double sy,
                                List<Contour> contours, String title) {
        return Png.encode(draw(backgroundSlice, nx, ny, sx, sy, contours, title, null, null));
    }

    /**
     * As {@link #render(float[], int, int, double, double, List, String)}, with the anatomical
     * directions at the edges: {@code edges} = the letters at the left, right, top and bottom edge
     * ({@link #edgeLabels}), or {@code null} for none.
     */
    public static byte[] render(float[] backgroundSlice, int nx, int ny, double sx, double sy,
                                List<Contour> contours, String title, String[] edges) {
        return Png.encode(draw(backgroundSlice, nx, ny, sx, sy, contours, title, edges, null));
    }

    /**
     * The anatomical direction letters at the left, right, top and bottom edges of a picture of a
     * slice of constant k shown in array order (i to the right, j downwards), from the affine in the
     * RAS+ convention of {@link Geometry}: the right edge is where voxel axis i points, named by the
     * world axis it runs most along ({@code +x} R, {@code +y} A, {@code +z} S; negative L, P, I, as
     * nibabel's {@code aff2axcodes}), the left edge the opposite; likewise j for the bottom and top.
     */
    public static String[] edgeLabels(Geometry g) {
        String i = direction(g, 0);
        String j = direction(g, 1);
        return new String[] {opposite(i), i, opposite(j), j};
    }

    /** The plane of a slice of constant k: axial, coronal or sagittal, from the world axis k runs along. */
    public static String planeName(Geometry g) {
        return switch (direction(g, 2)) {
            case "S", "I" -> "axial";
            case "A", "P" -> "coronal";
            default -> "sagittal";
        };
    }

    /** The direction letter of voxel axis {@code axis} (0, 1, 2): the dominant world component, first on ties. */
    static String direction(Geometry g, int axis) {
        int best = 0;
        for (int w = 1; w < 3; w++) {
            if (Math.abs(g.affine(w, axis)) > Math.abs(g.affine(best, axis))) {
                best = w;
            }
        }
        boolean positive = g.affine(best, axis) >= 0;
        return positive ? new String[] {"R", "A", "S"}[best] : new String[] {"L", "P", "I"}[best];
    }

    static String opposite(String d) {
        return switch (d) {
            case "R" -> "L";
            case "L" -> "R";
            case "A" -> "P";
            case "P" -> "A";
            case "S" -> "I";
            default -> "S";
        };
    }

    static BufferedImage draw(float[] background, int nx, int ny, double sx, double sy,
                              List<Contour> contours, String title, String[] edges, Layout[] layoutOut) {
        if (nx < 1 || ny < 1 || (long) nx * ny > 16L * 1024 * 1024) {
            throw new IllegalArgumentException("slice size " + nx + "x" + ny + " not supported");
        }
        if (!(sx > 0) || !(sy > 0) || Double.isInfinite(sx) || Double.isInfinite(sy)) {
            throw new IllegalArgumentException("pixel spacing must be positive and finite: " + sx + " x " + sy);
        }
        if (background != null && background.length != nx * ny) {
            throw new IllegalArgumentException("background has " + background.length + " pixels, expected " + nx * ny);
        }
        for (Contour c : contours) {
            if (c.sliceMask().length != nx * ny) {
                throw new IllegalArgumentException("mask of " + c.reader() + " has " + c.sliceMask().length + " pixels, expected " + nx * ny);
            }
        }
        // picture size of the slice: aspect from the physical extent, longest side within limits
        double widthMm = nx * sx;
        double heightMm = ny * sy;
        double nativeLongest = Math.max(widthMm / Math.min(sx, sy), heightMm / Math.min(sx, sy));
        double longest = Math.max(MIN_LONGEST_SIDE_PX, Math.min(MAX_LONGEST_SIDE_PX, nativeLongest));
        double pxPerMm = longest / Math.max(widthMm, heightMm);
        int w = Math.max(1, (int) Math.round(widthMm * pxPerMm));
        int h = Math.max(1, (int) Math.round(heightMm * pxPerMm));

        List<String> readers = new ArrayList<>(new TreeSet<>(contours.stream().map(Contour::reader).toList()));
        List<String> centres = new ArrayList<>(new TreeSet<>(contours.stream().map(Contour::centre).toList()));

        int pictureWidth = Math.max(w + 2 * MARGIN, 500);
        int offsetX = (pictureWidth - w) / 2;
        int titleH = 26;
        int orientationH = 58;
        int columns = Math.max(1, (pictureWidth - 2 * MARGIN) / 200);
        int legendRows = (contours.size() + columns - 1) / columns;
        int legendH = 20 + legendRows * 20 + 24;
        int pictureHeight = MARGIN + titleH + h + orientationH + legendH + MARGIN;
        BufferedImage img = Png.newImage(pictureWidth, pictureHeight);
        Graphics2D g = Png.graphics(img, true);
        try {
            g.setColor(Color.WHITE);
            g.fillRect(0, 0, pictureWidth, pictureHeight);
            g.setColor(Palette.INK);
            g.setFont(TITLE);
            g.drawString(fit(g, title == null ? "" : title, pictureWidth - 2 * MARGIN), MARGIN, MARGIN + 17);
            int offsetY = MARGIN + titleH;
            Layout layout = new Layout(offsetX, offsetY, w, h);
            if (layoutOut != null) {
                layoutOut[0] = layout;
            }
            g.drawImage(background(background, nx, ny, w, h), offsetX, offsetY, null);
            g.setColor(Palette.GRID);
            g.drawRect(offsetX - 1, offsetY - 1, w + 1, h + 1);

            for (Contour c : contours) {
                Path2D path = boundary(c.sliceMask(), nx, ny, layout);
                g.setColor(Color.BLACK);
                g.setStroke(new BasicStroke(CONTOUR_WIDTH_PX + 2f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_MITER));
                g.draw(path);
            }
            for (Contour c : contours) {
                Path2D path = boundary(c.sliceMask(), nx, ny, layout);
                g.setColor(Palette.category(readers.indexOf(c.reader())));
                g.setStroke(Palette.lineStyle(centres.indexOf(c.centre()), CONTOUR_WIDTH_PX));
                g.draw(path);
            }

            drawScaleBar(g, layout, pxPerMm);
            if (edges != null) {
                drawEdgeLabels(g, layout, edges);
            }
            int y = offsetY + h + 16;
            g.setFont(TEXT);
            g.setColor(Palette.INK);
            String[] lines = {
                edges != null ? "Array order (no flip); edge letters: directions from the affine."
                    : "Image x to the right, image y downwards (array order, no anatomical flip).",
                String.format(Locale.ROOT, "Pixel %s \u00D7 %s mm. Lines follow the edges between voxels.",
                    Numbers.format(sx), Numbers.format(sy)),
                "Colour = reader, line style = centre.",
            };
            for (int i = 0; i < lines.length; i++) {
                g.drawString(fit(g, lines[i], pictureWidth - 2 * MARGIN), MARGIN, y + 16 * i);
            }
            y += orientationH;
            StringBuilder key = new StringBuilder("Centres: ");
            for (int i = 0; i < centres.size(); i++) {
                key.append(i == 0 ? "" : ", ").append(centres.get(i)).append(" = ").append(Palette.lineStyleName(i));
            }
            g.setColor(Palette.INK);
            g.drawString(fit(g, key.toString(), pictureWidth - 2 * MARGIN), MARGIN, y);
            int colWidth = (pictureWidth - 2 * MARGIN) / columns;
            List<Contour> legend = new ArrayList<>(contours);
            legend.sort(java.util.Comparator.comparing(Contour::reader).thenComparing(Contour::centre));
            for (int k = 0; k < legend.size(); k++) {
                Contour c = legend.get(k);
                int cx = MARGIN + (k % columns) * colWidth;
                int cy = y + 20 + (k / columns) * 20;
                g.setColor(Color.BLACK);
                g.setStroke(new BasicStroke(CONTOUR_WIDTH_PX + 2f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_MITER));
                g.draw(new Line2D.Double(cx, cy - 4, cx + 40, cy - 4));
                g.setColor(Palette.category(readers.indexOf(c.reader())));
                g.setStroke(Palette.lineStyle(centres.indexOf(c.centre()), CONTOUR_WIDTH_PX));
                g.draw(new Line2D.Double(cx, cy - 4, cx + 40, cy - 4));
                g.setColor(Palette.INK);
                g.drawString(fit(g, c.reader() + " (" + c.centre() + ")", colWidth - 52), cx + 48, cy);
            }
        } finally {
            g.dispose();
        }
        return img;
    }

    /** The direction letters at the middle of the left, right, top and bottom edges, white on a black halo. */
    static void drawEdgeLabels(Graphics2D g, Layout l, String[] edges) {
        g.setFont(EDGE);
        FontMetrics fm = g.getFontMetrics();
        int ascent = fm.getAscent();
        int cx = l.offsetX() + l.widthPx() / 2;
        int cy = l.offsetY() + l.heightPx() / 2;
        int[][] at = {
            {l.offsetX() + 6, cy + ascent / 2},
            {l.offsetX() + l.widthPx() - 6 - fm.stringWidth(edges[1]), cy + ascent / 2},
            {cx - fm.stringWidth(edges[2]) / 2, l.offsetY() + 4 + ascent},
            {cx - fm.stringWidth(edges[3]) / 2, l.offsetY() + l.heightPx() - 6},
        };
        for (int k = 0; k < 4; k++) {
            g.setColor(Color.BLACK);
            for (int dx = -1; dx <= 1; dx++) {
                for (int dy = -1; dy <= 1; dy++) {
                    g.drawString(edges[k], at[k][0] + dx, at[k][1] + dy);
                }
            }
            g.setColor(Color.WHITE);
            g.drawString(edges[k], at[k][0], at[k][1]);
        }
    }

    /** A white bar of a round length in mm (1, 2 or 5 times a power of ten, about a fifth of the width). */
    static void drawScaleBar(Graphics2D g, Layout l, double pxPerMm) {
        double targetMm = l.widthPx() / pxPerMm / 5;
        double p = Math.pow(10, Math.floor(Math.log10(targetMm)));
        double mm = targetMm >= 5 * p ? 5 * p : targetMm >= 2 * p ? 2 * p : p;
        double len = mm * pxPerMm;
        double x1 = l.offsetX() + l.widthPx() - 10;
        double y = l.offsetY() + l.heightPx() - 12;
        g.setStroke(new BasicStroke(5f));
        g.setColor(Color.BLACK);
        g.draw(new Line2D.Double(x1 - len - 1, y, x1 + 1, y));
        g.setStroke(new BasicStroke(3f));
        g.setColor(Color.WHITE);
        g.draw(new Line2D.Double(x1 - len, y, x1, y));
        g.setFont(TEXT);
        String label = Numbers.format(mm) + " mm";
        int tw = g.getFontMetrics().stringWidth(label);
        g.setColor(Color.BLACK);
        g.drawString(label, (float) (x1 - tw + 1), (float) (y - 6 + 1));
        g.setColor(Color.WHITE);
        g.drawString(label, (float) (x1 - tw), (float) (y - 6));
    }

    /** The background in grey at the picture size, windowed with ImageJ. */
    static BufferedImage background(float[] slice, int nx, int ny, int w, int h) {
        if (slice == null) {
            BufferedImage b = new BufferedImage(w, h, BufferedImage.TYPE_INT_RGB);
            Graphics2D g = b.createGraphics();
            g.setColor(NO_BACKGROUND);
            g.fillRect(0, 0, w, h);
            g.dispose();
            return b;
        }
        double[] window = window(slice);
        float[] copy = slice.clone();
        for (int i = 0; i < copy.length; i++) {
            if (Float.isNaN(copy[i])) {
                copy[i] = (float) window[0];
            }
        }
        FloatProcessor fp = new FloatProcessor(nx, ny, copy);
        fp.setMinAndMax(window[0], window[1]);
        ByteProcessor grey = fp.convertToByteProcessor(true);
        grey.setInterpolationMethod(ImageProcessor.BILINEAR);
        ImageProcessor scaled = grey.resize(w, h, true);
        return scaled.getBufferedImage();
    }

    /** The 1st and 99th percentiles (nearest rank) of the finite values; a unit window if flat. */
    static double[] window(float[] values) {
        float[] v = new float[values.length];
        int n = 0;
        for (float f : values) {
            if (!Float.isNaN(f) && !Float.isInfinite(f)) {
                v[n++] = f;
            }
        }
        if (n == 0) {
            return new double[] {0, 1};
        }
        Arrays.sort(v, 0, n);
        double lo = v[Math.max(0, (int) Math.ceil(0.01 * n) - 1)];
        double hi = v[Math.max(0, (int) Math.ceil(0.99 * n) - 1)];
        if (!(hi > lo)) {
            hi = lo + 1;
        }
        return new double[] {lo, hi};
    }

    /**
     * The boundary of a mask as polylines along voxel edges: an edge between two face-neighbours
     * of which one is inside, or between an inside voxel and the grid's border. Edges are chained
     * into continuous paths (going straight on where possible) so that dash patterns run on.
     */
    static Path2D boundary(boolean[] mask, int nx, int ny, Layout layout) {
        // horizontal edge (i, j): corner (i, j) to (i+1, j), j = 0..ny; vertical (i, j): (i, j) to (i, j+1), i = 0..nx
        boolean[] hEdge = new boolean[nx * (ny + 1)];
        boolean[] vEdge = new boolean[(nx + 1) * ny];
        for (int j = 0; j <= ny; j++) {
            for (int i = 0; i < nx; i++) {
                boolean above = j > 0 && mask[i + nx * (j - 1)];
                boolean below = j < ny && mask[i + nx * j];
                hEdge[i + nx * j] = above != below;
            }
        }
        for (int j = 0; j < ny; j++) {
            for (int i = 0; i <= nx; i++) {
                boolean left = i > 0 && mask[i - 1 + nx * j];
                boolean right = i < nx && mask[i + nx * j];
                vEdge[i + (nx + 1) * j] = left != right;
            }
        }
        Path2D.Double path = new Path2D.Double();
        for (int pass = 0; pass < 2; pass++) {
            boolean[] edges = pass == 0 ? hEdge : vEdge;
            for (int e = 0; e < edges.length; e++) {
                if (!edges[e]) {
                    continue;
                }
                int ci;
                int cj;
                int dir; // 0 right, 1 down, 2 left, 3 up
                if (pass == 0) {
                    ci = e % nx;
                    cj = e / nx;
                    dir = 0;
                } else {
                    ci = e % (nx + 1);
                    cj = e / (nx + 1);
                    dir = 1;
                }
                path.moveTo(layout.x(ci, nx), layout.y(cj, ny));
                int si = ci;
                int sj = cj;
                while (true) {
                    // take the edge from (ci, cj) in direction dir
                    switch (dir) {
                        case 0 -> { hEdge[ci + nx * cj] = false; ci++; }
                        case 1 -> { vEdge[ci + (nx + 1) * cj] = false; cj++; }
                        case 2 -> { hEdge[ci - 1 + nx * cj] = false; ci--; }
                        default -> { vEdge[ci + (nx + 1) * (cj - 1)] = false; cj--; }
                    }
                    int next = -1;
                    for (int turn : new int[] {0, 1, 3}) { // straight on, then right, then left
                        int d = (dir + turn) % 4;
                        if (has(hEdge, vEdge, nx, ny, ci, cj, d)) {
                            next = d;
                            break;
                        }
                    }
                    if (next != dir) {
                        path.lineTo(layout.x(ci, nx), layout.y(cj, ny));
                    }
                    if (next < 0) {
                        if (ci == si && cj == sj) {
                            path.closePath();
                        }
                        break;
                    }
                    dir = next;
                }
            }
        }
        return path;
    }

    private static boolean has(boolean[] hEdge, boolean[] vEdge, int nx, int ny, int ci, int cj, int dir) {
        return switch (dir) {
            case 0 -> ci < nx && hEdge[ci + nx * cj];
            case 1 -> cj < ny && vEdge[ci + (nx + 1) * cj];
            case 2 -> ci > 0 && hEdge[ci - 1 + nx * cj];
            default -> cj > 0 && vEdge[ci + (nx + 1) * (cj - 1)];
        };
    }

    private static String fit(Graphics2D g, String text, int maxWidth) {
        FontMetrics fm = g.getFontMetrics();
        if (fm.stringWidth(text) <= maxWidth) {
            return text;
        }
        String s = text;
        while (!s.isEmpty() && fm.stringWidth(s + "\u2026") > maxWidth) {
            s = s.substring(0, s.length() - 1);
        }
        return s + "\u2026";
    }
}
