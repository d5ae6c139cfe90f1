package org.accordia.report;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.io.ByteArrayInputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.Test;

class OverlaysTest {

    static final int N = 10;

    static boolean[] box(int x0, int x1, int y0, int y1) {
        boolean[] m = new boolean[N * N];
        for (int y = y0; y <= y1; y++) {
            for (int x = x0; x <= x1; x++) {
                m[x + N * y] = true;
            }
        }
        return m;
    }

    static float[] gradient() {
        float[] bg = new float[N * N];
        for (int i = 0; i < bg.length; i++) {
            bg[i] = (i % N) * 10f + (i / N);
        }
        return bg;
    }

    static int rgb(BufferedImage img, double x, double y) {
        return img.getRGB((int) Math.floor(x), (int) Math.floor(y)) & 0xffffff;
    }

    @Test
    void contourPixelsHaveTheReaderColourOnTheVoxelEdges() throws Exception {
        List<Overlays.Contour> contours = List.of(
            new Overlays.Contour("R1", "North", box(3, 6, 2, 5)),
            new Overlays.Contour("R2", "South", box(1, 2, 7, 8)));
        Overlays.Layout[] layout = new Overlays.Layout[1];
        BufferedImage img = Overlays.draw(gradient(), N, N, 1.0, 1.0, contours, "case-01 axial slice z = 4", null, layout);
        Overlays.Layout l = layout[0];
        assertEquals(Overlays.MIN_LONGEST_SIDE_PX, l.widthPx(), "10 voxels upscaled to the minimum longest side");
        assertEquals(Overlays.MIN_LONGEST_SIDE_PX, l.heightPx());
        int r1 = Palette.category(0).getRGB() & 0xffffff; // readers sorted: R1 first
        // R1's left edge runs along x = 3 (between voxels 2 and 3) from y = 2 to 6; its centre (solid line)
        double ex = l.x(3, N);
        double ey = l.y(4, N);
        assertEquals(r1, rgb(img, ex - 0.5, ey), "on the edge, just left of it");
        assertEquals(r1, rgb(img, ex + 0.5, ey), "on the edge, just right of it");
        // the bottom edge at y = 6, the right edge at x = 7
        assertEquals(r1, rgb(img, l.x(5, N), l.y(6, N) - 0.5));
        assertEquals(r1, rgb(img, l.x(7, N) - 0.5, l.y(3, N)));
        // not filled: the middle of the box shows the grey background
        int inside = rgb(img, l.x(4.5, N), l.y(3.5, N));
        assertEquals(inside >> 16 & 0xff, inside & 0xff);
        assertEquals(inside >> 8 & 0xff, inside & 0xff);
        // away from the edge (half a voxel) there is no reader colour
        assertNotEquals(r1, rgb(img, ex - 19, ey));
        // R2 (centre South: dashed) shows its colour somewhere along its top edge at y = 7
        int r2 = Palette.category(1).getRGB() & 0xffffff;
        boolean found = false;
        for (double x = l.x(1, N); x < l.x(3, N); x += 1) {
            found |= rgb(img, x, l.y(7, N) - 0.5) == r2;
        }
        assertTrue(found, "R2's dashed contour");
        // and gaps of the dash pattern let the halo or background through
        boolean gap = false;
        for (double x = l.x(1, N) + 2; x < l.x(3, N) - 2; x += 1) {
            gap |= rgb(img, x, l.y(7, N) - 0.5) != r2;
        }
        assertTrue(gap, "dashed, not solid");
    }

    @Test
    void respectsThePixelAspectRatio() {
        Overlays.Layout[] layout = new Overlays.Layout[1];
        Overlays.draw(null, N, N, 0.5, 1.0, List.of(new Overlays.Contour("R1", "A", box(0, 9, 0, 9))), "t", null, layout);
        assertEquals(2 * layout[0].widthPx(), layout[0].heightPx(), "0.5 mm x 1 mm pixels: twice as tall");
        assertEquals(Overlays.MIN_LONGEST_SIDE_PX, layout[0].heightPx());
    }

    @Test
    void edgesOfAMaskTouchingTheBorderAndAHoleAreDrawn() {
        boolean[] ring = box(0, 9, 0, 9);
        ring[5 + N * 5] = false; // a one-voxel hole
        Overlays.Layout[] layout = new Overlays.Layout[1];
        BufferedImage img = Overlays.draw(null, N, N, 1, 1, List.of(new Overlays.Contour("R1", "A", ring)), "t", null, layout);
        Overlays.Layout l = layout[0];
        int r1 = Palette.category(0).getRGB() & 0xffffff;
        assertEquals(r1, rgb(img, l.x(5, N) + 0.5, l.y(5.5, N)), "hole's left edge");
        assertEquals(r1, rgb(img, l.x(0, N) + 0.5, l.y(5, N)), "grid border counts as outside");
    }

    @Test
    void windowIsTheFirstToNinetyNinthPercentile() {
        float[] v = new float[100];
        for (int i = 0; i < 100; i++) {
            v[i] = 100 - i; // 1..100
        }
        // nearest-rank percentiles (common practice): rank ceil(p*n)
        assertArrayEquals(new double[] {1, 99}, Overlays.window(v));
        assertArrayEquals(new double[] {5, 6}, Overlays.window(new float[] {5, 5, Float.NaN}), "flat: unit window");
    }

    @Test
    void pngIsValidAndDeterministic() throws Exception {
        List<Overlays.Contour> contours = List.of(
            new Overlays.Contour("R2", "South", box(2, 7, 2, 7)),
            new Overlays.Contour("R1", "North", box(3, 6, 2, 5)),
            new Overlays.Contour("R3", "North", box(3, 7, 3, 6)));
        byte[] png = Overlays.render(gradient(), N, N, 0.8, 0.8, contours, "case <07> \u00B7 liver \u00B7 axial slice z = 23");
        BufferedImage img = ImageIO.read(new ByteArrayInputStream(png));
        assertTrue(img.getWidth() >= Overlays.MIN_LONGEST_SIDE_PX);
        assertArrayEquals(png, Overlays.render(gradient(), N, N, 0.8, 0.8, contours, "case <07> \u00B7 liver \u00B7 axial slice z = 23"));
        String dir = System.getProperty("accordia.chartDir");
        if (dir != null) {
            Files.createDirectories(Path.of(dir));
            Files.write(Path.of(dir, "overlay.png"), png);
        }
    }

    // Direction letters in the RAS+ convention (Geometry): the world axis a voxel axis runs most along,
    // +x R, +y A, +z S, negative L, P, I. Expected values from the convention of nibabel's
    // orientations.aff2axcodes (from memory: eye(4) -> ('R', 'A', 'S'); diag(-1, -1, 1, 1) -> ('L', 'P', 'S')).
    static org.accordia.io.Geometry geometry(double[][] columns) {
        double[][] a = new double[4][4];
        for (int c = 0; c < 3; c++) {
            for (int r = 0; r < 3; r++) {
                a[r][c] = columns[c][r];
            }
        }
        a[3][3] = 1;
        return new org.accordia.io.Geometry(new int[] {8, 8, 8}, new double[] {1, 1, 1}, a);
    }

    @Test
    void edgeLettersFollowTheAffine() {
        // identity (RAS+): i towards R, so R on the right edge; j towards A, so A at the bottom
        var ras = geometry(new double[][] {{1, 0, 0}, {0, 1, 0}, {0, 0, 1}});
        assertArrayEquals(new String[] {"L", "R", "P", "A"}, Overlays.edgeLabels(ras));
        assertEquals("axial", Overlays.planeName(ras));
        // i flipped: the same slice seen with R on the left
        var flippedX = geometry(new double[][] {{-1, 0, 0}, {0, 1, 0}, {0, 0, 1}});
        assertArrayEquals(new String[] {"R", "L", "P", "A"}, Overlays.edgeLabels(flippedX));
        // LPS-stored data (diag(-1, -1, 1)): L on the right, P at the bottom
        var lps = geometry(new double[][] {{-0.8, 0, 0}, {0, -0.8, 0}, {0, 0, 2.5}});
        assertArrayEquals(new String[] {"R", "L", "A", "P"}, Overlays.edgeLabels(lps));
        // a sagittal acquisition: i along +y (A), j along -z (towards I), k along x
        var sagittal = geometry(new double[][] {{0, 1, 0}, {0, 0, -1}, {1, 0, 0}});
        assertArrayEquals(new String[] {"P", "A", "S", "I"}, Overlays.edgeLabels(sagittal));
        assertEquals("sagittal", Overlays.planeName(sagittal));
        // slightly oblique: the dominant component names the direction
        var oblique = geometry(new double[][] {{0.97, 0.24, 0}, {-0.24, 0.97, 0}, {0, 0, 1}});
        assertArrayEquals(new String[] {"L", "R", "P", "A"}, Overlays.edgeLabels(oblique));
    }

    @Test
    void edgeLettersAreDrawnAtTheEdges() {
        Overlays.Layout[] with = new Overlays.Layout[1];
        BufferedImage a = Overlays.draw(null, N, N, 1, 1, List.of(new Overlays.Contour("R1", "A", box(2, 4, 2, 4))),
            "t", new String[] {"L", "R", "P", "A"}, with);
        BufferedImage b = Overlays.draw(null, N, N, 1, 1, List.of(new Overlays.Contour("R1", "A", box(2, 4, 2, 4))),
            "t", null, new Overlays.Layout[1]);
        Overlays.Layout l = with[0];
        // white letter pixels near the middle of the left and right edges (the field is dark grey)
        assertTrue(hasWhite(a, l.offsetX(), l.offsetY() + l.heightPx() / 2 - 12, 20, 24), "left letter");
        assertTrue(hasWhite(a, l.offsetX() + l.widthPx() - 20, l.offsetY() + l.heightPx() / 2 - 12, 20, 24), "right letter");
        assertTrue(!hasWhite(b, l.offsetX(), l.offsetY() + l.heightPx() / 2 - 12, 20, 24), "no letter without edges");
    }

    static boolean hasWhite(BufferedImage img, int x0, int y0, int w, int h) {
        for (int y = y0; y < y0 + h; y++) {
            for (int x = x0; x < x0 + w; x++) {
                if ((img.getRGB(x, y) & 0xFFFFFF) == 0xFFFFFF) {
                    return true;
                }
            }
        }
        return false;
    }
}
