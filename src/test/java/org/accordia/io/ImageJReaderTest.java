package org.accordia.io;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import ij.ImagePlus;
import ij.ImageStack;
import ij.io.FileSaver;
import ij.process.ByteProcessor;
import ij.process.ColorProcessor;
import ij.process.FloatProcessor;
import ij.process.ShortProcessor;
import java.awt.image.BufferedImage;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Path;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** TIFF and PNG masks through ImageJ. */
class ImageJReaderTest {
    @TempDir
    Path dir;

    /**
     * A minimal uncompressed baseline TIFF assembled byte by byte after the TIFF 6.0
     * specification (Adobe, 1992, section 2 and the baseline fields of section 8): 3x2 8-bit grey,
     * XResolution 20 px per unit, YResolution 10 px per unit, ResolutionUnit 3 (centimetre).
     * Expected spacing: 1/20 cm = 0.5 mm and 1/10 cm = 1 mm; a single slice gets 1 mm in z (our
     * convention, docs/formats.md).
     */
    @Test
    void handBuiltTiffWithCentimetreResolution() throws Exception {
        int entries = 11;
        int ifd = 8;
        int rationals = ifd + 2 + 12 * entries + 4;
        int pixels = rationals + 16;
        ByteBuffer b = ByteBuffer.allocate(pixels + 6).order(ByteOrder.LITTLE_ENDIAN);
        b.put((byte) 'I').put((byte) 'I').putShort((short) 42).putInt(ifd);
        b.putShort((short) entries);
        entry(b, 256, 3, 1, 3);          // ImageWidth
        entry(b, 257, 3, 1, 2);          // ImageLength
        entry(b, 258, 3, 1, 8);          // BitsPerSample
        entry(b, 259, 3, 1, 1);          // Compression: none
        entry(b, 262, 3, 1, 1);          // PhotometricInterpretation: BlackIsZero
        entry(b, 273, 4, 1, pixels);     // StripOffsets
        entry(b, 277, 3, 1, 1);          // SamplesPerPixel
        entry(b, 278, 3, 1, 2);          // RowsPerStrip
        entry(b, 279, 4, 1, 6);          // StripByteCounts
        entry(b, 282, 5, 1, rationals);  // XResolution
        entry(b, 283, 5, 1, rationals + 8); // YResolution
        // ResolutionUnit (tag 296) is inserted as a 12th entry by withResolutionUnit below.
        b.putInt(0); // next IFD: none
        b.putInt(20).putInt(1).putInt(10).putInt(1);
        b.put(new byte[] {0, 1, 2, 3, 4, 5});
        byte[] bytes = withResolutionUnit(b.array(), entries, ifd);
        Path f = TestFiles.write(dir.resolve("hand.tif"), bytes);
        LabelVolume v = Volumes.readLabels(f, ReadLimits.DEFAULT);
        assertArrayEquals(new int[] {3, 2, 1}, v.geometry().dims());
        assertArrayEquals(new byte[] {0, 1, 2, 3, 4, 5}, v.bytes());
        assertEquals(5, v.label(2, 1, 0)); // row 1, column 2 = last byte of the strip
        assertArrayEquals(new double[] {0.5, 1.0, 1.0}, v.geometry().spacingMm(), 1e-9);
    }

    private static void entry(ByteBuffer b, int tag, int type, int count, int value) {
        b.putShort((short) tag).putShort((short) type).putInt(count);
        if (type == 3) {
            b.putShort((short) value).putShort((short) 0);
        } else {
            b.putInt(value);
        }
    }

    /** Inserts ResolutionUnit = 3 as a 12th IFD entry (tags stay ascending), shifting offsets by 12. */
    private static byte[] withResolutionUnit(byte[] in, int entries, int ifd) {
        ByteBuffer src = ByteBuffer.wrap(in).order(ByteOrder.LITTLE_ENDIAN);
        int end = ifd + 2 + 12 * entries;
        ByteBuffer out = ByteBuffer.allocate(in.length + 12).order(ByteOrder.LITTLE_ENDIAN);
        out.put(in, 0, end);
        out.putShort(ifd, (short) (entries + 1));
        entry(out, 296, 3, 1, 3);
        out.put(in, end, in.length - end);
        // Shift the offsets held by StripOffsets (entry 6), XResolution (10) and YResolution (11).
        for (int e : new int[] {5, 9, 10}) {
            int at = ifd + 2 + 12 * e + 8;
            out.putInt(at, src.getInt(at) + 12);
        }
        return out.array();
    }

    @Test
    void sixteenBitStackWithMicronCalibration() throws Exception {
        ImageStack stack = new ImageStack(4, 3);
        for (int z = 0; z < 2; z++) {
            short[] p = new short[12];
            for (int i = 0; i < 12; i++) {
                p[i] = (short) (z == 1 && i == 5 ? 40000 : i + 100 * z);
            }
            stack.addSlice(new ShortProcessor(4, 3, p, null));
        }
        ImagePlus imp = new ImagePlus("mask", stack);
        imp.getCalibration().pixelWidth = 500;
        imp.getCalibration().pixelHeight = 250;
        imp.getCalibration().pixelDepth = 2000;
        imp.getCalibration().setUnit("micron");
        Path f = dir.resolve("stack.tif");
        assertTrue(new FileSaver(imp).saveAsTiffStack(f.toString()));
        LabelVolume v = Volumes.readLabels(f, ReadLimits.DEFAULT);
        assertArrayEquals(new int[] {4, 3, 2}, v.geometry().dims());
        // 1 micron = 0.001 mm.
        assertArrayEquals(new double[] {0.5, 0.25, 2.0}, v.geometry().spacingMm(), 1e-12);
        assertEquals(40000, v.label(1, 1, 1));
        assertEquals(107, v.label(3, 1, 1));
        assertEquals(11, v.label(3, 2, 0));
    }

    @Test
    void eightBitPngWithoutUnitIsOneMillimetrePerPixel() throws Exception {
        byte[] p = {0, 1, 2, 0, 3, 3};
        Path f = dir.resolve("slice.png");
        assertTrue(new FileSaver(new ImagePlus("s", new ByteProcessor(3, 2, p.clone()))).saveAsPng(f.toString()));
        LabelVolume v = Volumes.readLabels(f, ReadLimits.DEFAULT);
        assertArrayEquals(p, v.bytes());
        assertArrayEquals(new double[] {1, 1, 1}, v.geometry().spacingMm());
    }

    @Test
    void sixteenBitPngWrittenByImageIo() throws Exception {
        BufferedImage img = new BufferedImage(3, 2, BufferedImage.TYPE_USHORT_GRAY);
        short[] data = ((java.awt.image.DataBufferUShort) img.getRaster().getDataBuffer()).getData();
        int[] values = {0, 300, 65535, 7, 0, 1};
        for (int i = 0; i < 6; i++) {
            data[i] = (short) values[i];
        }
        Path f = dir.resolve("wide.png");
        assertTrue(ImageIO.write(img, "png", f.toFile()));
        assertArrayEquals(values, Volumes.readLabels(f, ReadLimits.DEFAULT).ints());
    }

    @Test
    void rgbAndNonIntegralFloatAreRefused() throws Exception {
        Path rgb = dir.resolve("colour.png");
        assertTrue(new FileSaver(new ImagePlus("c", new ColorProcessor(3, 2))).saveAsPng(rgb.toString()));
        InputException e = assertThrows(InputException.class, () -> Volumes.readLabels(rgb, ReadLimits.DEFAULT));
        assertTrue(e.getMessage().contains("colour.png") && e.getMessage().contains("RGB"), e.getMessage());

        float[] values = {0, 1, 2.5f, 3};
        Path fl = dir.resolve("float.tif");
        assertTrue(new FileSaver(new ImagePlus("f", new FloatProcessor(2, 2, values))).saveAsTiff(fl.toString()));
        e = assertThrows(InputException.class, () -> Volumes.readLabels(fl, ReadLimits.DEFAULT));
        assertTrue(e.getMessage().contains("float.tif") && e.getMessage().contains("non-integral label value 2.5"), e.getMessage());
        assertArrayEquals(values, Volumes.readImage(fl, ReadLimits.DEFAULT).data());
    }

    @Test
    void declaredSizeIsCheckedAgainstTheLimit() throws Exception {
        Path f = dir.resolve("big.png");
        assertTrue(new FileSaver(new ImagePlus("s", new ByteProcessor(30, 20))).saveAsPng(f.toString()));
        InputException e = assertThrows(InputException.class, () -> Volumes.readLabels(f, ReadLimits.DEFAULT.withMaxVoxels(100)));
        assertTrue(e.getMessage().contains("big.png") && e.getMessage().contains("600 voxels"), e.getMessage());
        Path t = dir.resolve("big.tif");
        assertTrue(new FileSaver(new ImagePlus("s", new ByteProcessor(30, 20))).saveAsTiff(t.toString()));
        e = assertThrows(InputException.class, () -> Volumes.readLabels(t, ReadLimits.DEFAULT.withMaxVoxels(100)));
        assertTrue(e.getMessage().contains("big.tif") && e.getMessage().contains("600 voxels"), e.getMessage());
    }

    @Test
    void garbageIsRefused() throws Exception {
        Path f = TestFiles.write(dir.resolve("junk.tif"), TestFiles.ascii("this is not a tiff at all"));
        InputException e = assertThrows(InputException.class, () -> Volumes.readLabels(f, ReadLimits.DEFAULT));
        assertTrue(e.getMessage().contains("junk.tif"), e.getMessage());
        Path p = TestFiles.write(dir.resolve("junk.png"), TestFiles.ascii("this is not a png at all"));
        e = assertThrows(InputException.class, () -> Volumes.readLabels(p, ReadLimits.DEFAULT));
        assertTrue(e.getMessage().contains("junk.png") && e.getMessage().contains("bad magic"), e.getMessage());
    }

    /**
     * A baseline TIFF (the hand-built one above) whose next-directory offset points back at its
     * own directory: ImageJ's decoder would follow it for ever; we refuse the loop first.
     */
    @Test
    @org.junit.jupiter.api.Timeout(value = 60, threadMode = org.junit.jupiter.api.Timeout.ThreadMode.SEPARATE_THREAD)
    void directoryChainLoopIsRefused() throws Exception {
        Path good = dir.resolve("good.tif");
        assertTrue(new FileSaver(new ImagePlus("s", new ByteProcessor(3, 2, new byte[] {0, 1, 2, 0, 3, 3}))).saveAsTiff(good.toString()));
        byte[] bytes = java.nio.file.Files.readAllBytes(good);
        ByteBuffer b = ByteBuffer.wrap(bytes).order(bytes[0] == 'I' ? ByteOrder.LITTLE_ENDIAN : ByteOrder.BIG_ENDIAN);
        int ifd = b.getInt(4);
        int entries = b.getShort(ifd) & 0xFFFF;
        b.putInt(ifd + 2 + 12 * entries, ifd); // next directory: itself
        Path loop = TestFiles.write(dir.resolve("loop.tif"), bytes);
        for (var read : java.util.List.<org.junit.jupiter.api.function.Executable>of(
                () -> Volumes.readLabels(loop, ReadLimits.DEFAULT),
                () -> Volumes.readImage(loop, ReadLimits.DEFAULT),
                () -> Volumes.readGeometry(loop, ReadLimits.DEFAULT))) {
            InputException e = assertThrows(InputException.class, read);
            assertTrue(e.getMessage().contains("loop.tif") && e.getMessage().contains("chain loops"), e.getMessage());
        }
        // a two-directory cycle (1 -> 2 -> 1) is a loop too
        Path two = dir.resolve("two.tif");
        ImageStack stack = new ImageStack(3, 2);
        stack.addSlice(new ByteProcessor(3, 2));
        stack.addSlice(new ByteProcessor(3, 2));
        assertTrue(new FileSaver(new ImagePlus("s", stack)).saveAsTiffStack(two.toString()));
        byte[] t = java.nio.file.Files.readAllBytes(two);
        ByteBuffer tb = ByteBuffer.wrap(t).order(t[0] == 'I' ? ByteOrder.LITTLE_ENDIAN : ByteOrder.BIG_ENDIAN);
        int first = tb.getInt(4);
        int second = tb.getInt(first + 2 + 12 * (tb.getShort(first) & 0xFFFF));
        tb.putInt(second + 2 + 12 * (tb.getShort(second) & 0xFFFF), first);
        Path cycle = TestFiles.write(dir.resolve("cycle.tif"), t);
        InputException e = assertThrows(InputException.class, () -> Volumes.readLabels(cycle, ReadLimits.DEFAULT));
        assertTrue(e.getMessage().contains("chain loops"), e.getMessage());
        assertArrayEquals(new int[] {3, 2, 2}, Volumes.readLabels(two, ReadLimits.DEFAULT).geometry().dims());
    }
}
