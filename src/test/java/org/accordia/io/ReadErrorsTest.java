package org.accordia.io;

import static org.accordia.io.TestFiles.ascii;
import static org.accordia.io.TestFiles.bytes;
import static org.accordia.io.TestFiles.concat;
import static org.accordia.io.TestFiles.gzip;
import static org.accordia.io.TestFiles.write;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.io.IOException;
import java.io.OutputStream;
import java.lang.management.ManagementFactory;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.zip.Deflater;
import java.util.zip.GZIPOutputStream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * One test per bad-input path: each must throw {@link InputException} whose one-line message
 * names the file and the problem. NIfTI header offsets from nifti1.h / nifti2.h.
 */
class ReadErrorsTest {
    @TempDir
    Path dir;

    /** Reads labels and returns the message, checking it names the file and contains the phrases. */
    static String fails(Path file, String... phrases) {
        return fails(file, ReadLimits.DEFAULT, phrases);
    }

    static String fails(Path file, ReadLimits limits, String... phrases) {
        InputException e = assertThrows(InputException.class, () -> Volumes.readLabels(file, limits));
        String m = e.getMessage();
        assertTrue(m.contains(file.getFileName().toString()), "names the file: " + m);
        for (String p : phrases) {
            assertTrue(m.contains(p), "expected \"" + p + "\" in: " + m);
        }
        assertTrue(!m.contains("\n"), "one line");
        return m;
    }

    /** A little-endian NIfTI-1 header (352 bytes incl. extension) for a 4x3x2 grid of the given datatype. */
    static ByteBuffer nifti1(short datatype, int bitpix) {
        byte[] h = NiftiWriter.header(Geometry.axisAligned(4, 3, 2, 1, 1, 1), datatype, bitpix, 0, 0);
        return ByteBuffer.wrap(h).order(ByteOrder.LITTLE_ENDIAN);
    }

    static byte[] withData(ByteBuffer header, byte[] data) {
        return concat(header.array(), data);
    }

    /** A NIfTI-2 header (544 bytes) with the given dims, uint8, little-endian. */
    static ByteBuffer nifti2(long... dims) {
        ByteBuffer h = ByteBuffer.allocate(544).order(ByteOrder.LITTLE_ENDIAN);
        h.putInt(0, 540);
        h.put(4, new byte[] {'n', '+', '2', 0, '\r', '\n', 0x1a, '\n'});
        h.putShort(12, (short) 2);
        h.putShort(14, (short) 8);
        h.putLong(16, dims.length);
        for (int i = 0; i < dims.length; i++) {
            h.putLong(24 + 8 * i, dims[i]);
        }
        for (int i = 0; i < 8; i++) {
            h.putDouble(104 + 8 * i, 1.0);
        }
        h.putLong(168, 544);
        return h;
    }

    @Test
    void missingFile() {
        fails(dir.resolve("nowhere.nii.gz"), "file not found");
    }

    @Test
    void missingFileThroughReader() {
        InputException e = assertThrows(InputException.class,
            () -> new NiftiReader().readLabels(dir.resolve("gone.nii"), ReadLimits.DEFAULT));
        assertTrue(e.getMessage().contains("gone.nii") && e.getMessage().contains("file not found"), e.getMessage());
    }

    @Test
    void truncatedHeader() throws IOException {
        byte[] h = nifti1((short) 2, 8).array();
        fails(write(dir.resolve("short.nii"), java.util.Arrays.copyOf(h, 200)), "truncated header", "200 bytes");
    }

    @Test
    void truncatedData() throws IOException {
        fails(write(dir.resolve("cut.nii"), withData(nifti1((short) 2, 8), new byte[10])),
            "truncated data: expected 24 bytes, found 10");
        fails(write(dir.resolve("cut.nii.gz"), gzip(withData(nifti1((short) 2, 8), new byte[10]))),
            "truncated data: expected 24 bytes, found 10");
    }

    @Test
    void badMagic() throws IOException {
        ByteBuffer h = nifti1((short) 2, 8);
        h.put(344, ascii("abc\0"));
        fails(write(dir.resolve("magic.nii"), withData(h, new byte[24])), "bad magic");
        fails(write(dir.resolve("magic.nrrd"), ascii("NRRX0004\ntype: uchar\n\n")), "bad magic");
        fails(write(dir.resolve("magic.mha"), ascii("P5 hello\n")), "bad magic");
    }

    @Test
    void detachedNiftiPairIsRefused() throws IOException {
        ByteBuffer h = nifti1((short) 2, 8);
        h.put(344, ascii("ni1\0"));
        fails(write(dir.resolve("pair.nii"), withData(h, new byte[24])), "detached .hdr/.img pair");
    }

    @Test
    void wrongSizeofHdr() throws IOException {
        ByteBuffer h = nifti1((short) 2, 8);
        h.putInt(0, 1234);
        fails(write(dir.resolve("size.nii"), withData(h, new byte[24])), "bad header", "sizeof_hdr");
    }

    @Test
    void bigEndianHeaderWithLittleEndianSizeofHdr() throws IOException {
        // A big-endian header whose sizeof_hdr was written little-endian: the order chosen from
        // sizeof_hdr is wrong for everything else, so dim[0] = 3 reads as 768.
        ByteBuffer h = nifti1((short) 2, 8);
        ByteBuffer be = ByteBuffer.allocate(352).order(ByteOrder.BIG_ENDIAN);
        be.put(0, h.array());
        be.putInt(0, 348);
        for (int i = 0; i < 8; i++) {
            be.putShort(40 + 2 * i, h.getShort(40 + 2 * i));
        }
        byte[] bytes = be.array();
        ByteBuffer.wrap(bytes).order(ByteOrder.LITTLE_ENDIAN).putInt(0, 348);
        fails(write(dir.resolve("order.nii"), concat(bytes, new byte[24])), "dim[0] = 768", "byte order");
        // sizeof_hdr readable in neither order.
        ByteBuffer.wrap(bytes).putInt(0, 0x01020304);
        fails(write(dir.resolve("order2.nii"), concat(bytes, new byte[24])), "bad header");
    }

    @Test
    void zeroAndNegativeDimension() throws IOException {
        ByteBuffer h = nifti1((short) 2, 8);
        h.putShort(44, (short) 0);
        fails(write(dir.resolve("zero.nii"), withData(h, new byte[24])), "dim[2] = 0");
        h.putShort(44, (short) -5);
        fails(write(dir.resolve("neg.nii"), withData(h, new byte[24])), "dim[2] = -5");
        fails(write(dir.resolve("zero.nrrd"), ascii("NRRD0004\ntype: uchar\ndimension: 3\nsizes: 3 0 2\nencoding: raw\n\n")),
            "dimension 2 is 0");
    }

    @Test
    void dimensionProductOverflowing64Bits() throws IOException {
        long big = 1L << 40;
        fails(write(dir.resolve("overflow.nii"), nifti2(big, big, big).array()), "overflow");
        fails(write(dir.resolve("overflow.nrrd"),
            ascii("NRRD0004\ntype: uchar\ndimension: 3\nsizes: 4000000000 4000000000 4000000000\nencoding: raw\n\n")),
            "overflow");
        fails(write(dir.resolve("overflow.mha"),
            ascii("NDims = 3\nDimSize = 4000000000 4000000000 4000000000\nElementType = MET_UCHAR\nElementDataFile = LOCAL\n")),
            "overflow");
    }

    @Test
    void trillionVoxelsInOneKilobyteAllocateNothing() throws IOException {
        byte[] kb = new byte[1024 - 544];
        Path f = write(dir.resolve("huge.nii"), concat(nifti2(10_000, 10_000, 10_000).array(), kb));
        fails(f, "declares 1000000000000 voxels", "limit");
        // Within the array limit but far beyond the file: refused before any allocation. The
        // thread's allocation counter shows the reader never allocates the 2 GB it declares.
        Path g = write(dir.resolve("large.nii"), concat(nifti2(2000, 1000, 1000).array(), kb));
        Path gz = write(dir.resolve("large.nii.gz"), gzip(concat(nifti2(2000, 1000, 1000).array(), kb)));
        var bean = ManagementFactory.getThreadMXBean();
        assumeTrue(bean instanceof com.sun.management.ThreadMXBean);
        var sun = (com.sun.management.ThreadMXBean) bean;
        long before = sun.getThreadAllocatedBytes(Thread.currentThread().getId());
        fails(g, "truncated data: expected 2000000000 bytes, found 480");
        fails(gz, "truncated data: expected 2000000000 bytes", "can expand to at most");
        long allocated = sun.getThreadAllocatedBytes(Thread.currentThread().getId()) - before;
        assertTrue(allocated < 64L << 20, "allocated " + allocated + " bytes");
    }

    @Test
    void voxOffsetBeyondFile() throws IOException {
        ByteBuffer h = nifti1((short) 2, 8);
        h.putFloat(108, 100_000f);
        fails(write(dir.resolve("offset.nii"), withData(h, new byte[24])), "vox_offset 100000 is beyond the end of the file");
        fails(write(dir.resolve("offset.nii.gz"), gzip(withData(h, new byte[24]))), "truncated data", "starting at byte 100000");
        h.putFloat(108, 400f);
        fails(write(dir.resolve("offset2.nii.gz"), gzip(withData(h, new byte[24]))), "ends before the payload starts (at byte 400)");
        h.putFloat(108, 100f);
        fails(write(dir.resolve("inside.nii"), withData(h, new byte[24])), "vox_offset");
    }

    @Test
    void corruptGzip() throws IOException {
        byte[] labels = new byte[4000];
        for (int i = 0; i < labels.length; i++) {
            labels[i] = (byte) (i * 31 % 7);
        }
        Path ok = dir.resolve("ok.nii.gz");
        NiftiWriter.writeLabels(ok, LabelVolume.ofBytes(Geometry.axisAligned(40, 20, 5, 1, 1, 1), labels));
        byte[] b = Files.readAllBytes(ok);
        for (int i = b.length / 2; i < b.length / 2 + 8; i++) {
            b[i] ^= 0x5A;
        }
        fails(write(dir.resolve("corrupt.nii.gz"), b), "corrupt gzip stream");
        // Damaged CRC in the trailer.
        byte[] c = Files.readAllBytes(ok);
        c[c.length - 6] ^= 0x01;
        fails(write(dir.resolve("crc.nii.gz"), c), "corrupt gzip stream");
    }

    @Test
    void gzipBombStopsAtTheDeclaredSize() throws IOException {
        // 10 voxels declared, 200 MB of zeros compressed (about 200 KB on disk).
        ByteBuffer h = nifti1((short) 2, 8);
        h.putShort(42, (short) 10);
        h.putShort(44, (short) 1);
        h.putShort(46, (short) 1);
        Path f = dir.resolve("bomb.nii.gz");
        try (OutputStream os = new GZIPOutputStream(Files.newOutputStream(f), 1 << 16) {
            {
                def.setLevel(Deflater.BEST_SPEED);
            }
        }) {
            os.write(h.array());
            byte[] zeros = new byte[1 << 20];
            for (int i = 0; i < 200; i++) {
                os.write(zeros);
            }
        }
        assertTrue(Files.size(f) < 2_000_000);
        fails(f, "payload larger than declared");
    }

    @Test
    void unsupportedDatatype() throws IOException {
        fails(write(dir.resolve("rgb.nii"), withData(nifti1((short) 128, 24), new byte[72])), "unsupported datatype 128");
        fails(write(dir.resolve("complex.nii"), withData(nifti1((short) 32, 64), new byte[192])), "unsupported datatype 32");
    }

    @Test
    void nonIntegralFloatLabelAndNaN() throws IOException {
        float[] v = new float[24];
        v[5] = 1.5f;
        fails(write(dir.resolve("half.nii"), withData(nifti1((short) 16, 32), TestFiles.floats(ByteOrder.LITTLE_ENDIAN, v))),
            "non-integral label value 1.5", "(1, 1, 0)");
        v[5] = 0;
        v[13] = Float.NaN;
        fails(write(dir.resolve("nan.nii"), withData(nifti1((short) 16, 32), TestFiles.floats(ByteOrder.LITTLE_ENDIAN, v))),
            "NaN", "(1, 0, 1)");
        // Scaling that makes integers non-integral.
        ByteBuffer h = nifti1((short) 4, 16);
        h.putFloat(112, 0.5f);
        fails(write(dir.resolve("scaled.nii"), withData(h, TestFiles.shorts(ByteOrder.LITTLE_ENDIAN, new int[] {0, 3, 0, 0, 0, 0,
            0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0}))), "non-integral label value 1.5", "after scaling");
    }

    @Test
    void negativeLabel() throws IOException {
        int[] v = new int[24];
        v[2] = -1;
        fails(write(dir.resolve("negative.nii"), withData(nifti1((short) 4, 16), TestFiles.shorts(ByteOrder.LITTLE_ENDIAN, v))),
            "negative label value -1", "(2, 0, 0)");
    }

    @Test
    void fourDimensionalWithThreeTimePoints() throws Exception {
        ByteBuffer h = nifti1((short) 2, 8);
        h.putShort(40, (short) 4);
        h.putShort(48, (short) 3);
        fails(write(dir.resolve("series.nii"), withData(h, new byte[72])), "dim[4] = 3", "3 time points");
        fails(write(dir.resolve("series.mha"), concat(ascii(
            "NDims = 4\nDimSize = 4 3 2 3\nElementType = MET_UCHAR\nElementDataFile = LOCAL\n"), new byte[72])), "3 time points");
        // The same 4-D file with one time point reads fine.
        h.putShort(48, (short) 1);
        Path one = write(dir.resolve("single.nii"), withData(h, new byte[24]));
        assertArrayEquals(new int[] {4, 3, 2}, Volumes.readGeometry(one, ReadLimits.DEFAULT).dims());
    }

    @Test
    void nrrdMissingSizes() throws IOException {
        fails(write(dir.resolve("nosizes.nrrd"), ascii("NRRD0004\ntype: uchar\ndimension: 3\nencoding: raw\n\n")),
            "missing required field \"sizes\"");
    }

    @Test
    void nrrdUnsupportedEncoding() throws IOException {
        fails(write(dir.resolve("bz.nrrd"), ascii("NRRD0004\ntype: uchar\ndimension: 1\nsizes: 4\nencoding: bzip2\n\n")),
            "unsupported encoding \"bzip2\"");
    }

    @Test
    void detachedNrrdDataFileMissing() throws IOException {
        Path f = write(dir.resolve("lost.nhdr"),
            ascii("NRRD0004\ntype: uchar\ndimension: 3\nsizes: 3 2 2\nencoding: raw\ndata file: lost.raw\n"));
        fails(f, "data file not found", "lost.raw");
    }

    @Test
    void metaImageMissingRawFile() throws IOException {
        Path f = write(dir.resolve("lost.mhd"),
            ascii("NDims = 3\nDimSize = 3 2 2\nElementType = MET_UCHAR\nElementDataFile = lost_data.raw\n"));
        fails(f, "data file not found", "lost_data.raw");
    }

    @Test
    void metaImageTruncatedLocalData() throws IOException {
        Path f = write(dir.resolve("short.mha"), concat(ascii(
            "NDims = 3\nDimSize = 3 2 2\nElementType = MET_SHORT\nElementDataFile = LOCAL\n"), bytes(1, 2, 3)));
        fails(f, "truncated data: expected 24 bytes, found 3");
    }

    @Test
    void unknownExtension() throws IOException {
        Path f = write(dir.resolve("mask.xyz"), bytes(1, 2, 3));
        fails(f, "unrecognised volume format");
    }
}
