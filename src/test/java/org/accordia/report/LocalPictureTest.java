package org.accordia.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.io.ByteArrayInputStream;
import java.util.List;
import javax.imageio.ImageIO;
import org.accordia.shift.LocalEffect;
import org.junit.jupiter.api.Test;

/** The picture of where a centre differs: shown only when a centre passes the local minimum. */
class LocalPictureTest {
    static List<LocalEffect> effects(double excessLo) {
        return List.of(
            new LocalEffect("esterhaven", 3, 12, 2.0, 0.06, 0.0, -0.02, 0.02, 0.1, 0.0, -0.01, 0.01,
                List.of(0.06, 0.06, 0.06, 0.06, 0.06, 0.06)),
            new LocalEffect("norvale", 3, 12, 2.0, 0.24, 0.18, excessLo, 0.24, 0.02, -0.08, -0.1, -0.05,
                List.of(0.62, 0.05, 0.1, 0.1, 0.2, 0.2)),
            new LocalEffect("quillbay", 3, 12, 2.0, 0.07, 0.0, -0.02, 0.02, 0.1, 0.0, -0.01, 0.01,
                List.of(0.07, 0.07, 0.07, 0.07, 0.07, Double.NaN)));
    }

    @Test
    void rendersAndIsShownOnlyWhenACentrePassesTheMinimum() throws Exception {
        assertTrue(LocalPicture.worthShowing(effects(0.12), 0.10));
        assertFalse(LocalPicture.worthShowing(effects(0.08), 0.10));
        byte[] png = LocalPicture.chart(effects(0.12), "lesion", 900, 420);
        BufferedImage img = ImageIO.read(new ByteArrayInputStream(png));
        assertEquals(900, img.getWidth());
        assertEquals(420, img.getHeight());
        if (System.getProperty("accordia.picture.out") != null) {
            java.nio.file.Files.write(java.nio.file.Path.of(System.getProperty("accordia.picture.out")), png);
        }
    }
}
