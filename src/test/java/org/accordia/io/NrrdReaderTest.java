package org.accordia.io;

import static org.accordia.io.TestFiles.ascii;
import static org.accordia.io.TestFiles.bytes;
import static org.accordia.io.TestFiles.concat;
import static org.accordia.io.TestFiles.gzip;
import static org.accordia.io.TestFiles.shorts;
import static org.accordia.io.TestFiles.write;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.ByteOrder;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * NRRD headers written by hand, values checked against the NRRD format specification (Teem,
 * "Definition of NRRD File Format", NRRD0005): axis 0 fastest; "space directions" give one column
 * per axis in the named space; "space origin" is the centre of the first sample; LPS coordinates
 * become RAS by negating x and y (common practice); byte skip -1 means the data end the raw file;
 * for gzip the byte skip applies to the decompressed data and line skip to the raw file (as Teem
 * implements them).
 */
class NrrdReaderTest {
    @TempDir
    Path dir;

    static final int[] VALUES = {0, 1, 2, 3, 0, 1, 2, 3, 3, 2, 1, 0};

    static void assertAffine(double[][] expected, Geometry g) {
        for (int r = 0; r < 4; r++) {
            assertArrayEquals(expected[r], g.affine()[r], 1e-12, "row " + r);
        }
    }

    @Test
    void attachedRawLpsOblique() throws Exception {
        String header = """
            NRRD0005
            # a 3x2x2 uint8 mask in LPS, first axis along (0.6, 0.8, 0) * 2 mm
            type: uint8
            dimension: 3
            space: left-posterior-superior
            sizes: 3 2 2
            space directions: (1.2,1.6,0) (-0.8,0.6,0) (0,0,3)
            space origin: (10,-20,5)
            encoding: raw

            """;
        Path f = write(dir.resolve("a.nrrd"), concat(ascii(header), bytes(VALUES)));
        LabelVolume v = Volumes.readLabels(f, ReadLimits.DEFAULT);
        assertArrayEquals(bytes(VALUES), v.bytes());
        assertArrayEquals(new int[] {3, 2, 2}, v.geometry().dims());
        // Spacing = lengths of the direction vectors: |(1.2,1.6,0)| = 2, |(-0.8,0.6,0)| = 1, 3.
        assertArrayEquals(new double[] {2, 1, 3}, v.geometry().spacingMm(), 1e-12);
        // RAS = LPS with x and y negated, columns and origin alike.
        assertAffine(new double[][] {
            {-1.2, 0.8, 0, -10},
            {-1.6, -0.6, 0, 20},
            {0, 0, 3, 5},
            {0, 0, 0, 1}}, v.geometry());
        // voxel (1, 1, 0) is at index 1 + 3 * 1 = 4.
        assertEquals(VALUES[4], v.label(1, 1, 0));
    }

    @Test
    void attachedGzipBigEndianRas() throws Exception {
        String header = """
            NRRD0004
            type: unsigned short
            dimension: 3
            space: RAS
            sizes: 2 3 2
            space directions: (0.5,0,0) (0,0.5,0) (0,0,1.5)
            space origin: (1,2,3)
            endian: big
            encoding: gzip

            """;
        int[] values = {0, 300, 65535, 2, 7, 0, 1, 1, 1, 2, 2, 400};
        Path f = write(dir.resolve("b.nrrd"), concat(ascii(header), gzip(shorts(ByteOrder.BIG_ENDIAN, values))));
        LabelVolume v = Volumes.readLabels(f, ReadLimits.DEFAULT);
        assertArrayEquals(values, v.ints());
        assertAffine(new double[][] {{0.5, 0, 0, 1}, {0, 0.5, 0, 2}, {0, 0, 1.5, 3}, {0, 0, 0, 1}}, v.geometry());
    }

    @Test
    void detachedRawWithLineAndByteSkip() throws Exception {
        String header = """
            NRRD0004
            type: short
            dimension: 3
            sizes: 3 2 2
            spacings: 0.8 0.9 2.5
            endian: little
            encoding: raw
            data file: data/mask.raw
            line skip: 2
            byte skip: 3
            """;
        write(dir.resolve("data/mask.raw"), concat(ascii("junk line one\nline two\n"), bytes(9, 9, 9),
            shorts(ByteOrder.LITTLE_ENDIAN, VALUES)));
        Path f = write(dir.resolve("d.nhdr"), ascii(header));
        LabelVolume v = Volumes.readLabels(f, ReadLimits.DEFAULT);
        assertArrayEquals(bytes(VALUES), v.bytes());
        // No space directions: spacings on the diagonal, no world frame (taken as is).
        assertAffine(new double[][] {{0.8, 0, 0, 0}, {0, 0.9, 0, 0}, {0, 0, 2.5, 0}, {0, 0, 0, 1}}, v.geometry());
    }

    @Test
    void byteSkipMinusOneReadsTheEndOfTheFile() throws Exception {
        String header = """
            NRRD0004
            type: uchar
            dimension: 2
            sizes: 4 3
            encoding: raw
            data file: tail.bin
            byte skip: -1
            """;
        write(dir.resolve("tail.bin"), concat(ascii("some preamble of any length"), bytes(VALUES)));
        Path f = write(dir.resolve("t.nhdr"), ascii(header));
        LabelVolume v = Volumes.readLabels(f, ReadLimits.DEFAULT);
        assertArrayEquals(bytes(VALUES), v.bytes());
        assertArrayEquals(new int[] {4, 3, 1}, v.geometry().dims());
    }

    @Test
    void gzipByteSkipAppliesAfterDecompression() throws Exception {
        String header = """
            NRRD0004
            type: uint8
            dimension: 3
            sizes: 3 2 2
            encoding: gz
            byte skip: 5

            """;
        Path f = write(dir.resolve("g.nrrd"), concat(ascii(header), gzip(concat(bytes(7, 7, 7, 7, 7), bytes(VALUES)))));
        assertArrayEquals(bytes(VALUES), Volumes.readLabels(f, ReadLimits.DEFAULT).bytes());
    }

    @Test
    void nonSpatialAxisOfOneSampleIsAccepted() throws Exception {
        String header = """
            NRRD0005
            type: int8
            dimension: 4
            space: left-posterior-superior
            sizes: 1 3 2 2
            space directions: none (1,0,0) (0,1,0) (0,0,1)
            kinds: list domain domain domain
            encoding: raw

            """;
        Path f = write(dir.resolve("n.nrrd"), concat(ascii(header), bytes(VALUES)));
        LabelVolume v = Volumes.readLabels(f, ReadLimits.DEFAULT);
        assertArrayEquals(new int[] {3, 2, 2}, v.geometry().dims());
        assertAffine(new double[][] {{-1, 0, 0, 0}, {0, -1, 0, 0}, {0, 0, 1, 0}, {0, 0, 0, 1}}, v.geometry());
    }

    @Test
    void nonSpatialAxisWithSeveralSamplesIsRefused() throws Exception {
        String header = """
            NRRD0005
            type: uint8
            dimension: 4
            space: RAS
            sizes: 3 2 2 2
            space directions: (1,0,0) (0,1,0) (0,0,1) none
            encoding: raw

            """;
        Path f = write(dir.resolve("vec.nrrd"), concat(ascii(header), new byte[24]));
        InputException e = assertThrows(InputException.class, () -> Volumes.readLabels(f, ReadLimits.DEFAULT));
        assertTrue(e.getMessage().contains("vec.nrrd") && e.getMessage().contains("not spatial"), e.getMessage());
    }

    @Test
    void floatImageAndSpaceUnits() throws Exception {
        String header = """
            NRRD0005
            type: float
            dimension: 3
            space: LPS
            space units: "cm" "cm" "cm"
            sizes: 2 1 1
            space directions: (0.1,0,0) (0,0.1,0) (0,0,0.2)
            space origin: (1,1,1)
            endian: little
            encoding: raw

            """;
        Path f = write(dir.resolve("u.nrrd"), concat(ascii(header), TestFiles.floats(ByteOrder.LITTLE_ENDIAN, 0.25f, -1.5f)));
        ImageVolume v = Volumes.readImage(f, ReadLimits.DEFAULT);
        assertArrayEquals(new float[] {0.25f, -1.5f}, v.data());
        // 1 cm = 10 mm.
        assertArrayEquals(new double[] {1, 1, 2}, v.geometry().spacingMm(), 1e-12);
        assertAffine(new double[][] {{-1, 0, 0, -10}, {0, -1, 0, -10}, {0, 0, 2, 10}, {0, 0, 0, 1}}, v.geometry());
    }

    @Test
    void dataFileOutsideTheHeaderFolderIsRefusedUnlessAllowed() throws Exception {
        write(dir.resolve("outside.raw"), bytes(VALUES));
        String header = """
            NRRD0004
            type: uint8
            dimension: 3
            sizes: 3 2 2
            encoding: raw
            data file: ../outside.raw
            """;
        Path f = write(dir.resolve("inner/x.nhdr"), ascii(header));
        InputException e = assertThrows(InputException.class, () -> Volumes.readLabels(f, ReadLimits.DEFAULT));
        assertTrue(e.getMessage().contains("x.nhdr") && e.getMessage().contains("outside"), e.getMessage());
        LabelVolume v = Volumes.readLabels(f, new ReadLimits(ReadLimits.ARRAY_LIMIT, true));
        assertArrayEquals(bytes(VALUES), v.bytes());
    }

    @Test
    void typeSpellings() {
        // The type names listed in section 5 of the NRRD specification ("type").
        assertEquals(SampleType.INT8, NrrdReader.sampleType("signed char"));
        assertEquals(SampleType.UINT8, NrrdReader.sampleType("unsigned char"));
        assertEquals(SampleType.INT16, NrrdReader.sampleType("signed short int"));
        assertEquals(SampleType.UINT16, NrrdReader.sampleType("ushort"));
        assertEquals(SampleType.INT32, NrrdReader.sampleType("signed int"));
        assertEquals(SampleType.UINT32, NrrdReader.sampleType("unsigned int"));
        assertEquals(SampleType.INT64, NrrdReader.sampleType("long long int"));
        assertEquals(SampleType.UINT64, NrrdReader.sampleType("unsigned long long int"));
        assertEquals(SampleType.FLOAT32, NrrdReader.sampleType("float"));
        assertEquals(SampleType.FLOAT64, NrrdReader.sampleType("double"));
        assertEquals(null, NrrdReader.sampleType("block"));
    }
}
