package org.accordia.io;

import ij.ImagePlus;
import ij.ImageStack;
import ij.io.FileInfo;
import ij.io.FileOpener;
import ij.io.Opener;
import ij.io.RandomAccessStream;
import ij.io.TiffDecoder;
import ij.measure.Calibration;
import java.io.IOException;
import java.io.InputStream;
import java.io.RandomAccessFile;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.Locale;

/**
 * Reads TIFF stacks ({@code .tif}, {@code .tiff}) and PNG images through ImageJ's
 * {@link Opener}, headless.
 *
 * <p>Labels come from 8-bit (grey or indexed colour: the index is the label) and 16-bit grey
 * images (ImageJ's signed 16-bit calibration is undone), and from 32-bit float images whose
 * values are all integral; RGB images are refused. Slice k of a stack is z = k; row 0 of an image
 * is y = 0 (no flip). Spacing comes from ImageJ's {@link Calibration} (pixelWidth, pixelHeight,
 * pixelDepth) converted to mm from its units (mm, cm, m, µm/um/micron, nm, inch); an image
 * without a unit ("pixel") gets 1 mm per pixel times its pixel size. The affine is diagonal with
 * zero origin: these formats carry no orientation. A single image (one slice) gets a z spacing
 * of 1 mm. Before ImageJ reads any pixels, the size
 * declared by the TIFF directory or the PNG IHDR chunk is checked against the limits. A TIFF's
 * directory chain is walked first ({@link TiffDirectories}: loops and impossible value counts are
 * refused), ImageJ decodes the directories through a read budget, the pixels must be able to lie
 * in the file, and the pixels are then opened from those directories (ImageJ's {@code Opener}
 * would decode them again without a bound). See docs/formats.md.
 */
public final class ImageJReader implements VolumeReader {
    @Override
    public String formatName() {
        return "TIFF/PNG (ImageJ)";
    }

    @Override
    public boolean accepts(Path file) {
        String name = file.getFileName().toString().toLowerCase(Locale.ROOT);
        return name.endsWith(".tif") || name.endsWith(".tiff") || name.endsWith(".png");
    }

    @Override
    public LabelVolume readLabels(Path file, ReadLimits limits) throws InputException {
        ImagePlus imp = open(file, limits);
        Geometry g = geometry(file, imp);
        ImageStack stack = imp.getStack();
        int plane = g.nx() * g.ny();
        int type = imp.getType();
        if (type == ImagePlus.COLOR_RGB) {
            throw new InputException(file, "RGB image: label masks must be 8-bit or 16-bit grey (or integral 32-bit)");
        }
        if (type == ImagePlus.GRAY8 || type == ImagePlus.COLOR_256) {
            byte[] out = new byte[(int) g.voxelCount()];
            for (int z = 0; z < g.nz(); z++) {
                System.arraycopy((byte[]) stack.getPixels(z + 1), 0, out, z * plane, plane);
            }
            return LabelVolume.ofBytes(g, out);
        }
        int[] out = new int[(int) g.voxelCount()];
        boolean signed16 = imp.getCalibration().isSigned16Bit();
        for (int z = 0; z < g.nz(); z++) {
            Object pixels = stack.getPixels(z + 1);
            if (pixels instanceof short[] s) {
                for (int i = 0; i < plane; i++) {
                    int v = (s[i] & 0xFFFF) - (signed16 ? 32768 : 0);
                    if (v < 0) {
                        throw new InputException(file, "negative label value " + v + " at voxel " + Payload.where(g, (long) z * plane + i));
                    }
                    out[z * plane + i] = v;
                }
            } else if (pixels instanceof float[] f) {
                for (int i = 0; i < plane; i++) {
                    float v = f[i];
                    String where = Payload.where(g, (long) z * plane + i);
                    if (Float.isNaN(v)) {
                        throw new InputException(file, "label value NaN at voxel " + where);
                    }
                    if (v != Math.rint(v) || Float.isInfinite(v)) {
                        throw new InputException(file, "non-integral label value " + v + " at voxel " + where);
                    }
                    if (v < 0) {
                        throw new InputException(file, "negative label value " + (long) v + " at voxel " + where);
                    }
                    if (v > Integer.MAX_VALUE) {
                        throw new InputException(file, "label value " + (long) v + " exceeds the largest supported label at voxel " + where);
                    }
                    out[z * plane + i] = (int) v;
                }
            } else {
                throw new InputException(file, "unsupported ImageJ pixel type " + type);
            }
        }
        return LabelVolume.ofInts(g, out);
    }

    @Override
    public ImageVolume readImage(Path file, ReadLimits limits) throws InputException {
        ImagePlus imp = open(file, limits);
        Geometry g = geometry(file, imp);
        if (imp.getType() == ImagePlus.COLOR_RGB) {
            throw new InputException(file, "RGB image: only grey-value images are read");
        }
        ImageStack stack = imp.getStack();
        int plane = g.nx() * g.ny();
        float[] out = new float[(int) g.voxelCount()];
        float[] ctable = imp.getCalibration().getCTable();
        for (int z = 0; z < g.nz(); z++) {
            Object pixels = stack.getPixels(z + 1);
            for (int i = 0; i < plane; i++) {
                float v;
                if (pixels instanceof byte[] b) {
                    v = ctable != null ? ctable[b[i] & 0xFF] : b[i] & 0xFF;
                } else if (pixels instanceof short[] s) {
                    v = ctable != null ? ctable[s[i] & 0xFFFF] : s[i] & 0xFFFF;
                } else {
                    v = ((float[]) pixels)[i];
                }
                out[z * plane + i] = v;
            }
        }
        return new ImageVolume(g, out);
    }

    private static ImagePlus open(Path file, ReadLimits limits) throws InputException {
        InputFiles.requireRegular(file);
        boolean png = file.getFileName().toString().toLowerCase(Locale.ROOT).endsWith(".png");
        ImagePlus imp;
        try {
            if (png) {
                checkPngSize(file, limits);
                Opener opener = new Opener();
                opener.setSilentMode(true);
                imp = opener.openImage(file.toAbsolutePath().toString());
            } else {
                // ImageJ's Opener would decode the directories again, without a bound: open the
                // pixels from the directories we decoded with one (as Opener.openTiff2 does)
                FileInfo[] info = tiffInfo(file, limits);
                Opener opener = new Opener();
                opener.setSilentMode(true);
                imp = info.length > 1 ? opener.openTiffStack(info) : null;
                if (imp == null) {
                    imp = new FileOpener(info[0]).openImage();
                }
            }
        } catch (RuntimeException | OutOfMemoryError e) {
            throw new InputException(file, "ImageJ could not read the image: " + e, e);
        }
        if (imp == null) {
            throw new InputException(file, "ImageJ could not read the image (corrupt or unsupported variant)");
        }
        if (imp.getNChannels() > 1 || imp.getNFrames() > 1) {
            throw new InputException(file, "hyperstack with " + imp.getNChannels() + " channels and " + imp.getNFrames()
                + " time points; only a single-channel stack is read");
        }
        long count = (long) imp.getWidth() * imp.getHeight() * imp.getStackSize();
        if (count > limits.maxVoxels()) {
            throw new InputException(file, "declares " + count + " voxels, more than the limit of " + limits.maxVoxels());
        }
        return imp;
    }

    /** Checks the size the PNG IHDR chunk declares before ImageJ reads pixels. */
    private static void checkPngSize(Path file, ReadLimits limits) throws InputException {
        byte[] h;
        try (InputStream in = Files.newInputStream(file)) {
            h = in.readNBytes(24);
        } catch (NoSuchFileException e) {
            throw new InputException(file, "file not found");
        } catch (IOException e) {
            throw new InputException(file, "cannot read: " + e.getMessage(), e);
        }
        byte[] sig = {(byte) 0x89, 'P', 'N', 'G', '\r', '\n', 0x1A, '\n'};
        if (h.length < 24 || !java.util.Arrays.equals(java.util.Arrays.copyOf(h, 8), sig)) {
            throw new InputException(file, "bad magic: not a PNG file");
        }
        java.nio.ByteBuffer b = java.nio.ByteBuffer.wrap(h);
        long w = b.getInt(16) & 0xFFFFFFFFL;
        long ht = b.getInt(20) & 0xFFFFFFFFL;
        Payload.voxelCount(file, new long[] {w, ht}, limits);
    }

    /**
     * The TIFF's image directories as ImageJ decodes them, with two bounds ImageJ lacks: the
     * directory chain is walked first and a loop refused ({@link TiffDirectories}), and ImageJ's
     * decoder reads through a file that allows at most {@link #decoderBudget} bytes of reading in
     * all, so a chain that still loops in ImageJ's own reading ends with an error. The declared
     * size is then checked against the limits before any pixel is read.
     */
    private static FileInfo[] tiffInfo(Path file, ReadLimits limits) throws InputException {
        TiffDirectories.count(file, limits.maxVoxels());
        FileInfo[] info;
        long budget = 0;
        try {
            budget = decoderBudget(Files.size(file));
            try (CountingFile raf = new CountingFile(file.toFile(), budget)) {
                info = new BoundedTiffDecoder(file, raf).getTiffInfo();
            }
        } catch (BudgetExceeded e) {
            throw new InputException(file, "TIFF image directories still unread after " + e.budget
                + " bytes of reading (a directory chain that loops?)");
        } catch (IOException | RuntimeException | OutOfMemoryError e) {
            throw new InputException(file, "not a readable TIFF: " + e.getMessage(), e);
        }
        if (info == null || info.length == 0) {
            throw new InputException(file, "not a readable TIFF (no image directory)");
        }
        long slices = info.length > 1 ? info.length : Math.max(1, info[0].nImages);
        Payload.voxelCount(file, new long[] {info[0].width, info[0].height, slices}, limits);
        checkPixelsFit(file, info);
        return info;
    }

    /** Largest expansion assumed of a compressed TIFF strip (LZW, PackBits, deflate, ...). */
    private static final long COMPRESSED_MAX_RATIO = 4096;

    /**
     * Refuses directories whose pixels cannot be in the file, before ImageJ allocates and reads
     * them (ImageJ allocates the declared image first, and some of its pixel loops do not end on
     * a file that is too short): uncompressed pixels must fit between their offset and the end of
     * the file; compressed strips must lie inside the file and declare at most
     * {@value #COMPRESSED_MAX_RATIO} times their bytes (plus 1 MiB).
     */
    private static void checkPixelsFit(Path file, FileInfo[] info) throws InputException {
        long size;
        try {
            size = Files.size(file);
        } catch (IOException e) {
            throw new InputException(file, "cannot read: " + e.getMessage(), e);
        }
        for (int d = 0; d < info.length; d++) {
            FileInfo fi = info[d];
            long images = info.length > 1 ? 1 : Math.max(1, fi.nImages);
            long pixelBytes;
            long end;
            try {
                pixelBytes = Math.multiplyExact(Math.multiplyExact(Math.multiplyExact((long) fi.width, fi.height),
                    Math.max(1, fi.getBytesPerPixel())), images);
                end = Math.addExact(Math.addExact(fi.getOffset(), pixelBytes),
                    Math.multiplyExact(Math.max(0, fi.getGap()), images - 1));
            } catch (ArithmeticException e) {
                throw new InputException(file, "TIFF directory " + (d + 1) + " declares more pixel bytes than 64 bits count");
            }
            if (fi.getOffset() < 0 || fi.getOffset() > size) {
                throw new InputException(file, "TIFF directory " + (d + 1) + ": pixel data offset " + fi.getOffset()
                    + " lies outside the file (" + size + " bytes)");
            }
            if (d > 0 && fi.getOffset() < info[d - 1].getOffset()) {
                // ImageJ reads a stack's planes in one forward pass; a plane stored before the one
                // it follows sends some of its pixel loops spinning on the end of the stream
                throw new InputException(file, "TIFF directory " + (d + 1) + ": pixel data at offset " + fi.getOffset()
                    + " lies before the previous plane's (" + info[d - 1].getOffset() + "); planes must be stored in order");
            }
            if (fi.compression <= FileInfo.COMPRESSION_NONE) {
                if (end > size) {
                    throw new InputException(file, "truncated data: TIFF directory " + (d + 1) + " declares " + pixelBytes
                        + " bytes of uncompressed pixels from offset " + fi.getOffset() + ", the file has " + size + " bytes");
                }
                continue;
            }
            long compressed = 0;
            if (fi.stripOffsets != null && fi.stripLengths != null) {
                for (int i = 0; i < Math.min(fi.stripOffsets.length, fi.stripLengths.length); i++) {
                    long off = fi.stripOffsets[i] & 0xFFFFFFFFL;
                    long len = fi.stripLengths[i] & 0xFFFFFFFFL;
                    if (off + len > size) {
                        throw new InputException(file, "TIFF directory " + (d + 1) + ": strip " + (i + 1) + " (offset " + off
                            + ", " + len + " bytes) lies beyond the end of the file (" + size + " bytes)");
                    }
                    compressed += len;
                }
            } else {
                compressed = size - fi.getOffset();
            }
            if (pixelBytes > COMPRESSED_MAX_RATIO * compressed + (1 << 20)) {
                throw new InputException(file, "TIFF directory " + (d + 1) + " declares " + pixelBytes + " bytes of pixels in "
                    + compressed + " compressed bytes (more than " + COMPRESSED_MAX_RATIO + " times)");
            }
        }
    }

    /**
     * Bytes ImageJ's directory decoder may read from a file of {@code size} bytes: every byte four
     * times (directories, their value arrays and metadata are read once each in a well-formed
     * file; pixels are not read by the decoder) plus 1 MiB.
     */
    static long decoderBudget(long size) {
        return 4 * size + (1 << 20);
    }

    /** ImageJ's TIFF decoder reading through a {@link CountingFile}. */
    private static final class BoundedTiffDecoder extends TiffDecoder {
        BoundedTiffDecoder(Path file, RandomAccessFile raf) {
            super(file.toAbsolutePath().getParent() + java.io.File.separator, file.getFileName().toString());
            in = new RandomAccessStream(raf);
        }
    }

    /** A read-only file that throws {@link BudgetExceeded} once more than a budget of bytes was read. */
    private static final class CountingFile extends RandomAccessFile {
        private final long budget;
        private long read;

        CountingFile(java.io.File f, long budget) throws IOException {
            super(f, "r");
            this.budget = budget;
        }

        /**
         * Counts a read of {@code n} requested bytes, whether or not the file held them (ImageJ
         * keeps reading at the end of the file, and allocates what a directory asks for first).
         */
        private void count(int n) throws BudgetExceeded {
            read += Math.max(1, n);
            if (read > budget) {
                throw new BudgetExceeded(budget);
            }
        }

        @Override
        public int read() throws IOException {
            int b = super.read();
            count(1);
            return b;
        }

        @Override
        public int read(byte[] b, int off, int len) throws IOException {
            count(len);
            return super.read(b, off, len);
        }

        @Override
        public int read(byte[] b) throws IOException {
            return read(b, 0, b.length);
        }
    }

    /** Thrown by {@link CountingFile} when its budget is spent. */
    private static final class BudgetExceeded extends IOException {
        private static final long serialVersionUID = 1L;
        private final long budget;

        BudgetExceeded(long budget) {
            super("read budget of " + budget + " bytes spent");
            this.budget = budget;
        }
    }

    private static Geometry geometry(Path file, ImagePlus imp) throws InputException {
        Calibration cal = imp.getCalibration();
        double sx = scaled(file, "pixel width", cal.pixelWidth, cal.getXUnit());
        double sy = scaled(file, "pixel height", cal.pixelHeight, cal.getYUnit());
        // A single image has no slice thickness of its own: 1 mm by convention (ImageJ's default
        // pixelDepth of 1 "unit" would otherwise turn a centimetre calibration into 10 mm).
        double sz = imp.getStackSize() == 1 ? 1.0 : scaled(file, "pixel depth", cal.pixelDepth, cal.getZUnit());
        return Geometry.axisAligned(imp.getWidth(), imp.getHeight(), imp.getStackSize(), sx, sy, sz);
    }

    private static double scaled(Path file, String what, double size, String unit) throws InputException {
        String u = unit == null ? "" : unit.trim();
        double factor;
        if (u.isEmpty() || u.equalsIgnoreCase("pixel") || u.equalsIgnoreCase("pixels")) {
            factor = 1.0;
        } else {
            factor = TextHeaders.unitToMm(u);
            if (Double.isNaN(factor)) {
                throw new InputException(file, "unknown calibration unit \"" + u + "\" for the " + what);
            }
        }
        double mm = Math.abs(size) * factor;
        if (!(mm > 0) || Double.isInfinite(mm)) {
            throw new InputException(file, what + " " + size + " " + u + " is not a valid voxel size");
        }
        return mm;
    }
}
