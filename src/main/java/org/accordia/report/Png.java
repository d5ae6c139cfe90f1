package org.accordia.report;

import java.awt.Graphics2D;
import java.awt.RenderingHints;
import java.awt.image.BufferedImage;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.UncheckedIOException;
import javax.imageio.ImageIO;

/**
 * PNG encoding shared by {@link Charts} and {@link Overlays}. Everything is drawn into an off-screen
 * {@code BufferedImage}; no display is needed or opened. The command line runs with
 * {@code java.awt.headless=true} (set in {@code Main.main}, and by the test configuration); a
 * library user embedding these classes decides for their own process.
 */
final class Png {
    /** Smallest and largest picture side accepted, in pixels. */
    static final int MIN_SIDE = 64;
    static final int MAX_SIDE = 8192;

    private Png() {
    }

    static void checkSize(int widthPx, int heightPx) {
        if (widthPx < MIN_SIDE || heightPx < MIN_SIDE || widthPx > MAX_SIDE || heightPx > MAX_SIDE) {
            throw new IllegalArgumentException("picture size " + widthPx + "x" + heightPx
                + " px outside " + MIN_SIDE + ".." + MAX_SIDE);
        }
    }

    static BufferedImage newImage(int widthPx, int heightPx) {
        return new BufferedImage(widthPx, heightPx, BufferedImage.TYPE_INT_RGB);
    }

    static Graphics2D graphics(BufferedImage img, boolean antialias) {
        Graphics2D g = img.createGraphics();
        g.setRenderingHint(RenderingHints.KEY_ANTIALIASING,
            antialias ? RenderingHints.VALUE_ANTIALIAS_ON : RenderingHints.VALUE_ANTIALIAS_OFF);
        g.setRenderingHint(RenderingHints.KEY_TEXT_ANTIALIASING, RenderingHints.VALUE_TEXT_ANTIALIAS_ON);
        g.setRenderingHint(RenderingHints.KEY_RENDERING, RenderingHints.VALUE_RENDER_QUALITY);
        g.setRenderingHint(RenderingHints.KEY_STROKE_CONTROL, RenderingHints.VALUE_STROKE_PURE);
        g.setRenderingHint(RenderingHints.KEY_FRACTIONALMETRICS, RenderingHints.VALUE_FRACTIONALMETRICS_ON);
        return g;
    }

    /** Encodes as PNG (ImageIO writes no time stamp, so equal pixels give equal bytes). */
    static byte[] encode(BufferedImage img) {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        try {
            if (!ImageIO.write(img, "png", out)) {
                throw new IllegalStateException("no PNG writer available");
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return out.toByteArray();
    }
}
