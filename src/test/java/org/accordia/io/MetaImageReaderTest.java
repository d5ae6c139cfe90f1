package org.accordia.io;

import static org.accordia.io.TestFiles.ascii;
import static org.accordia.io.TestFiles.bytes;
import static org.accordia.io.TestFiles.concat;
import static org.accordia.io.TestFiles.shorts;
import static org.accordia.io.TestFiles.write;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.ByteOrder;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * MetaImage headers written by hand, checked against the MetaImage format description (MetaIO
 * documentation, Kitware/ITK): "Key = Value" lines, ElementDataFile last, LOCAL data right after
 * it, world space LPS. TransformMatrix lists index axis 0's direction first (as ITK writes it;
 * the ITK-written fixtures in ItkFixturesTest confirm this convention).
 */
class MetaImageReaderTest {
    @TempDir
    Path dir;

    static final int[] VALUES = {0, 1, 2, 3, 0, 1, 2, 3, 3, 2, 1, 0};

    static void assertAffine(double[][] expected, Geometry g) {
        for (int r = 0; r < 4; r++) {
            assertArrayEquals(expected[r], g.affine()[r], 1e-12, "row " + r);
        }
    }

    @Test
    void localObliqueLps() throws Exception {
        // Axis 0 runs along (0.6, 0.8, 0), axis 1 along (-0.8, 0.6, 0), axis 2 along z, in LPS.
        String header = """
            ObjectType = Image
            NDims = 3
            BinaryData = True
            BinaryDataByteOrderMSB = False
            CompressedData = False
            TransformMatrix = 0.6 0.8 0 -0.8 0.6 0 0 0 1
            Offset = 10 -20 5
            ElementSpacing = 2 1 3
            DimSize = 3 2 2
            ElementType = MET_UCHAR
            ElementDataFile = LOCAL
            """;
        Path f = write(dir.resolve("a.mha"), concat(ascii(header), bytes(VALUES)));
        LabelVolume v = Volumes.readLabels(f, ReadLimits.DEFAULT);
        assertArrayEquals(bytes(VALUES), v.bytes());
        assertArrayEquals(new double[] {2, 1, 3}, v.geometry().spacingMm(), 1e-12);
        // Column j = direction of axis j times spacing, then x and y negated (LPS -> RAS).
        assertAffine(new double[][] {
            {-1.2, 0.8, 0, -10},
            {-1.6, -0.6, 0, 20},
            {0, 0, 3, 5},
            {0, 0, 0, 1}}, v.geometry());
    }

    @Test
    void detachedBigEndianWithHeaderSize() throws Exception {
        String header = """
            NDims = 3
            DimSize = 3 2 2
            ElementSize = 0.5 0.5 2
            ElementType = MET_SHORT
            ElementByteOrderMSB = True
            HeaderSize = 4
            ElementDataFile = m.raw
            """;
        write(dir.resolve("m.raw"), concat(bytes(1, 2, 3, 4), shorts(ByteOrder.BIG_ENDIAN, VALUES)));
        Path f = write(dir.resolve("m.mhd"), ascii(header));
        LabelVolume v = Volumes.readLabels(f, ReadLimits.DEFAULT);
        assertArrayEquals(bytes(VALUES), v.bytes());
        // ElementSize used when ElementSpacing is absent; no Offset = origin 0.
        assertAffine(new double[][] {{-0.5, 0, 0, 0}, {0, -0.5, 0, 0}, {0, 0, 2, 0}, {0, 0, 0, 1}}, v.geometry());
    }

    @Test
    void headerSizeMinusOneAndZlibCompression() throws Exception {
        String raw = """
            NDims = 3
            DimSize = 3 2 2
            ElementType = MET_UCHAR
            HeaderSize = -1
            ElementDataFile = end.raw
            """;
        write(dir.resolve("end.raw"), concat(ascii("anything"), bytes(VALUES)));
        assertArrayEquals(bytes(VALUES), Volumes.readLabels(write(dir.resolve("end.mhd"), ascii(raw)), ReadLimits.DEFAULT).bytes());

        byte[] z = TestFiles.zlib(bytes(VALUES));
        String compressed = """
            NDims = 3
            DimSize = 3 2 2
            ElementType = MET_UCHAR
            CompressedData = True
            CompressedDataSize = %d
            ElementDataFile = LOCAL
            """.formatted(z.length);
        Path f = write(dir.resolve("z.mha"), concat(ascii(compressed), z));
        assertArrayEquals(bytes(VALUES), Volumes.readLabels(f, ReadLimits.DEFAULT).bytes());
    }

    @Test
    void twoDimensionalOblique() throws Exception {
        // 2-D: TransformMatrix has 4 numbers, axis 0 along (0, 1), axis 1 along (-1, 0).
        String header = """
            ObjectType = Image
            NDims = 2
            DimSize = 4 3
            ElementSpacing = 0.5 0.25
            Offset = 1 2
            TransformMatrix = 0 1 -1 0
            ElementType = MET_FLOAT
            ElementDataFile = LOCAL
            """;
        float[] values = new float[12];
        for (int i = 0; i < 12; i++) {
            values[i] = VALUES[i];
        }
        Path f = write(dir.resolve("two.mha"), concat(ascii(header), TestFiles.floats(ByteOrder.LITTLE_ENDIAN, values)));
        LabelVolume v = Volumes.readLabels(f, ReadLimits.DEFAULT);
        assertArrayEquals(new int[] {4, 3, 1}, v.geometry().dims());
        assertAffine(new double[][] {{0, 0.25, 0, -1}, {-0.5, 0, 0, -2}, {0, 0, 1, 0}, {0, 0, 0, 1}}, v.geometry());
    }

    @Test
    void elementTypes() {
        // Element types of the MetaImage format description; MET_LONG/MET_ULONG are 4 bytes in
        // MetaIO's type-size table (from memory).
        assertEquals(SampleType.INT8, MetaImageReader.sampleType("MET_CHAR"));
        assertEquals(SampleType.UINT8, MetaImageReader.sampleType("MET_UCHAR"));
        assertEquals(SampleType.INT16, MetaImageReader.sampleType("MET_SHORT"));
        assertEquals(SampleType.UINT16, MetaImageReader.sampleType("MET_USHORT"));
        assertEquals(SampleType.INT32, MetaImageReader.sampleType("MET_INT"));
        assertEquals(SampleType.UINT32, MetaImageReader.sampleType("MET_UINT"));
        assertEquals(SampleType.INT32, MetaImageReader.sampleType("MET_LONG"));
        assertEquals(SampleType.UINT32, MetaImageReader.sampleType("MET_ULONG"));
        assertEquals(SampleType.INT64, MetaImageReader.sampleType("MET_LONG_LONG"));
        assertEquals(SampleType.UINT64, MetaImageReader.sampleType("MET_ULONG_LONG"));
        assertEquals(SampleType.FLOAT32, MetaImageReader.sampleType("MET_FLOAT"));
        assertEquals(SampleType.FLOAT64, MetaImageReader.sampleType("MET_DOUBLE"));
    }
}
