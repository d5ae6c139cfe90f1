// Writes the seed inputs of TiffFuzzTest#read into TiffFuzzTestInputs/read/ (run from this folder):
//   java -cp "$(cat /tmp/cp.txt)" make-tiff-seeds.java      (the classpath needs ImageJ, net.imagej:ij)
// Seeds: ImageJ-written TIFFs (8-bit, 16-bit stack calibrated in microns, float, indexed colour),
// hand-built baseline TIFFs after the TIFF 6.0 specification (little- and big-endian, two strips,
// two chained directories) and one whose next-directory offset points back at itself.
import ij.ImagePlus;
import ij.ImageStack;
import ij.io.FileSaver;
import ij.process.ByteProcessor;
import ij.process.FloatProcessor;
import ij.process.ShortProcessor;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;

public class MakeTiffSeeds {
    public static void main(String[] args) throws Exception {
        Path out = Path.of("TiffFuzzTestInputs/read");
        Files.createDirectories(out);
        new FileSaver(new ImagePlus("a", new ByteProcessor(3, 2, new byte[] {0, 1, 2, 0, 3, 3}))).saveAsTiff(out.resolve("imagej-8bit").toString());
        ImageStack s = new ImageStack(4, 3);
        for (int z = 0; z < 2; z++) {
            short[] p = new short[12];
            for (int i = 0; i < 12; i++) {
                p[i] = (short) (i + 100 * z);
            }
            s.addSlice(new ShortProcessor(4, 3, p, null));
        }
        ImagePlus st = new ImagePlus("stack", s);
        st.getCalibration().pixelWidth = 500;
        st.getCalibration().pixelDepth = 2000;
        st.getCalibration().setUnit("micron");
        new FileSaver(st).saveAsTiffStack(out.resolve("imagej-16bit-stack").toString());
        new FileSaver(new ImagePlus("f", new FloatProcessor(2, 2, new float[] {0, 1, 2, 3}))).saveAsTiff(out.resolve("imagej-float").toString());
        ByteProcessor indexed = new ByteProcessor(2, 2, new byte[] {0, 1, 1, 2});
        indexed.setColorModel(new java.awt.image.IndexColorModel(8, 3, new byte[] {0, 10, 20}, new byte[] {0, 30, 40}, new byte[] {0, 50, 60}));
        new FileSaver(new ImagePlus("i", indexed)).saveAsTiff(out.resolve("imagej-indexed").toString());
        Files.write(out.resolve("hand-little-endian"), baseline(ByteOrder.LITTLE_ENDIAN, false, false));
        Files.write(out.resolve("hand-big-endian-two-strips"), baseline(ByteOrder.BIG_ENDIAN, true, false));
        Files.write(out.resolve("hand-two-directories"), baseline(ByteOrder.LITTLE_ENDIAN, false, true));
        byte[] loop = baseline(ByteOrder.LITTLE_ENDIAN, false, false);
        ByteBuffer.wrap(loop).order(ByteOrder.LITTLE_ENDIAN).putInt(8 + 2 + 12 * 9, 8);
        Files.write(out.resolve("hand-directory-loop"), loop);
    }

    /** 3x2 8-bit grey, uncompressed, one or two strips; optionally a second directory for a second slice. */
    static byte[] baseline(ByteOrder order, boolean twoStrips, boolean twoDirectories) {
        int entries = 9;
        int ifdBytes = 2 + 12 * entries + 4;
        int ifd1 = 8;
        int ifd2 = ifd1 + ifdBytes;
        int extra = ifd2 + (twoDirectories ? ifdBytes : 0);
        int pixels = extra + 8;
        ByteBuffer b = ByteBuffer.allocate(pixels + 12).order(order);
        b.put(order == ByteOrder.LITTLE_ENDIAN ? new byte[] {'I', 'I'} : new byte[] {'M', 'M'}).putShort((short) 42).putInt(ifd1);
        directory(b, twoStrips, pixels, extra, twoDirectories ? ifd2 : 0);
        if (twoDirectories) {
            directory(b, false, pixels + 6, extra, 0);
        }
        b.putInt(extra, pixels).putInt(extra + 4, pixels + 3);
        b.position(pixels);
        b.put(new byte[] {0, 1, 2, 3, 4, 5, 5, 4, 3, 2, 1, 0});
        return b.array();
    }

    static void directory(ByteBuffer b, boolean twoStrips, int pixels, int stripTable, int next) {
        b.putShort((short) 9);
        entry(b, 256, 3, 1, 3);
        entry(b, 257, 3, 1, 2);
        entry(b, 258, 3, 1, 8);
        entry(b, 259, 3, 1, 1);
        entry(b, 262, 3, 1, 1);
        entry(b, 273, 4, twoStrips ? 2 : 1, twoStrips ? stripTable : pixels);
        entry(b, 277, 3, 1, 1);
        entry(b, 278, 3, 1, twoStrips ? 1 : 2);
        entry(b, 279, 3, twoStrips ? 2 : 1, twoStrips ? (3 << 16 | 3) : 6);
        b.putInt(next);
    }

    static void entry(ByteBuffer b, int tag, int type, int count, int value) {
        b.putShort((short) tag).putShort((short) type).putInt(count);
        if (type == 3 && count == 1) {
            b.putShort((short) value).putShort((short) 0); // a SHORT value sits in the first two bytes
        } else if (type == 3) {
            b.putShort((short) (value >>> 16)).putShort((short) value);
        } else {
            b.putInt(value);
        }
    }
}
