package org.accordia.io;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Random;
import java.util.zip.GZIPInputStream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Round trips through {@link NiftiWriter} and {@link NiftiReader}, and the writer's header fields. */
class NiftiWriterTest {
    @TempDir
    Path dir;

    static Geometry oblique() {
        // A rotation of 30 degrees about z with anisotropic spacing 0.8 x 0.9 x 2.5 mm and an offset.
        double c = Math.cos(Math.toRadians(30));
        double s = Math.sin(Math.toRadians(30));
        double[][] a = {
            {0.8 * c, -0.9 * s, 0, -12.5},
            {0.8 * s, 0.9 * c, 0, 30.25},
            {0, 0, 2.5, -7},
            {0, 0, 0, 1}
        };
        return new Geometry(new int[] {5, 4, 3}, new double[] {0.8, 0.9, 2.5}, a);
    }

    static void assertGeometryClose(Geometry expected, Geometry actual, double tol) {
        assertArrayEquals(expected.dims(), actual.dims());
        assertArrayEquals(expected.spacingMm(), actual.spacingMm(), tol);
        for (int r = 0; r < 4; r++) {
            assertArrayEquals(expected.affine()[r], actual.affine()[r], tol, "affine row " + r);
        }
    }

    @Test
    void byteLabelsRoundTrip() throws Exception {
        Geometry g = oblique();
        byte[] labels = new byte[(int) g.voxelCount()];
        Random rnd = new Random(7);
        for (int i = 0; i < labels.length; i++) {
            labels[i] = (byte) rnd.nextInt(4);
        }
        Path out = dir.resolve("mask.nii.gz");
        NiftiWriter.writeLabels(out, LabelVolume.ofBytes(g, labels.clone()));
        LabelVolume back = new NiftiReader().readLabels(out, ReadLimits.DEFAULT);
        assertTrue(back.isCompact());
        assertArrayEquals(labels, back.bytes());
        assertGeometryClose(g, back.geometry(), 1e-5);
        NiftiReader.Header h = NiftiReader.readHeader(out, ReadLimits.DEFAULT);
        assertEquals(2, h.datatype());
        assertEquals(1, h.sformCode());
        assertEquals(1, h.qformCode());
    }

    @Test
    void wideLabelsUseUint16() throws Exception {
        Geometry g = Geometry.axisAligned(3, 2, 2, 1, 1, 1);
        int[] labels = {0, 1, 65535, 300, 2, 0, 0, 7, 1000, 3, 4, 5};
        Path out = dir.resolve("wide.nii");
        NiftiWriter.writeLabels(out, LabelVolume.ofInts(g, labels.clone()));
        assertEquals(512, NiftiReader.readHeader(out, ReadLimits.DEFAULT).datatype());
        LabelVolume back = new NiftiReader().readLabels(out, ReadLimits.DEFAULT);
        assertFalse(back.isCompact());
        assertArrayEquals(labels, back.ints());
        assertEquals(352 + 2 * 12, Files.size(out));
    }

    @Test
    void labelsAbove65535AreRefused() {
        Geometry g = Geometry.axisAligned(2, 1, 1, 1, 1, 1);
        LabelVolume v = LabelVolume.ofInts(g, new int[] {0, 65536});
        assertThrows(IllegalArgumentException.class, () -> NiftiWriter.writeLabels(dir.resolve("x.nii.gz"), v));
        assertFalse(Files.exists(dir.resolve("x.nii.gz")));
    }

    @Test
    void probabilityAndImageRoundTrip() throws Exception {
        Geometry g = oblique();
        float[] p = new float[(int) g.voxelCount()];
        for (int i = 0; i < p.length; i++) {
            p[i] = i / (float) p.length;
        }
        Path out = dir.resolve("p.nii.gz");
        NiftiWriter.writeProbability(out, g, p);
        ImageVolume back = new NiftiReader().readImage(out, ReadLimits.DEFAULT);
        assertArrayEquals(p, back.data());
        assertGeometryClose(g, back.geometry(), 1e-5);
        Path img = dir.resolve("img.nii");
        NiftiWriter.writeImage(img, new ImageVolume(g, p));
        assertArrayEquals(p, new NiftiReader().readImage(img, ReadLimits.DEFAULT).data());
    }

    @Test
    void outputIsDeterministicWithZeroGzipTime() throws Exception {
        Geometry g = oblique();
        byte[] labels = new byte[(int) g.voxelCount()];
        labels[3] = 1;
        Path a = dir.resolve("a.nii.gz");
        Path b = dir.resolve("sub/b.nii.gz");
        NiftiWriter.writeLabels(a, LabelVolume.ofBytes(g, labels));
        NiftiWriter.writeLabels(b, LabelVolume.ofBytes(g, labels));
        byte[] x = Files.readAllBytes(a);
        assertArrayEquals(x, Files.readAllBytes(b));
        // RFC 1952: bytes 4..7 are MTIME; flags (byte 3) 0 means no file name is stored.
        assertEquals(0x1f, x[0] & 0xFF);
        assertEquals(0x8b, x[1] & 0xFF);
        assertEquals(0, x[3]);
        assertEquals(0, ByteBuffer.wrap(x, 4, 4).order(ByteOrder.LITTLE_ENDIAN).getInt());
        try (var list = Files.list(dir)) {
            assertEquals(2, list.count(), "no temporary file left behind");
        }
    }

    @Test
    void compressionLevelsChangeOnlyTheDeflateStream() throws Exception {
        // mostly zeros with a block of values, like a consensus map
        Geometry g = Geometry.axisAligned(64, 48, 20, 0.7, 0.7, 1.5);
        int n = (int) g.voxelCount();
        float[] p = new float[n];
        byte[] labels = new byte[n];
        Random rnd = new Random(11);
        for (int i = 20_000; i < 24_000; i++) {
            p[i] = rnd.nextInt(9) / 8f;
            labels[i] = (byte) (p[i] >= 0.5f ? 1 : 0);
        }
        LabelVolume v = LabelVolume.ofBytes(g, labels);
        java.io.ByteArrayOutputStream fastP = new java.io.ByteArrayOutputStream();
        java.io.ByteArrayOutputStream smallP = new java.io.ByteArrayOutputStream();
        java.io.ByteArrayOutputStream rawP = new java.io.ByteArrayOutputStream();
        NiftiWriter.writeProbability(fastP, g, p, NiftiWriter.Compression.FAST);
        NiftiWriter.writeProbability(smallP, g, p, NiftiWriter.Compression.SMALL);
        NiftiWriter.writeProbability(rawP, g, p, NiftiWriter.Compression.NONE);
        // the same NIfTI bytes inside every gzip stream (RFC 1952 decoding by java.util.zip)
        assertArrayEquals(rawP.toByteArray(), gunzip(fastP.toByteArray()));
        assertArrayEquals(rawP.toByteArray(), gunzip(smallP.toByteArray()));
        assertFalse(java.util.Arrays.equals(fastP.toByteArray(), smallP.toByteArray()), "the levels differ");
        // SMALL is what a .nii.gz path gets; FAST is deterministic too
        Path path = dir.resolve("p.nii.gz");
        NiftiWriter.writeProbability(path, g, p);
        assertArrayEquals(smallP.toByteArray(), Files.readAllBytes(path));
        java.io.ByteArrayOutputStream again = new java.io.ByteArrayOutputStream();
        NiftiWriter.writeProbability(again, g, p, NiftiWriter.Compression.FAST);
        assertArrayEquals(fastP.toByteArray(), again.toByteArray());
        // the same map supplied row by row: the same bytes
        java.io.ByteArrayOutputStream byRows = new java.io.ByteArrayOutputStream();
        NiftiWriter.writeProbability(byRows, g,
            (y, z, row) -> System.arraycopy(p, g.nx() * (y + g.ny() * z), row, 0, g.nx()), NiftiWriter.Compression.FAST);
        assertArrayEquals(fastP.toByteArray(), byRows.toByteArray());
        java.io.ByteArrayOutputStream fastL = new java.io.ByteArrayOutputStream();
        java.io.ByteArrayOutputStream rawL = new java.io.ByteArrayOutputStream();
        NiftiWriter.writeLabels(fastL, v, NiftiWriter.Compression.FAST);
        NiftiWriter.writeLabels(rawL, v, NiftiWriter.Compression.NONE);
        assertArrayEquals(rawL.toByteArray(), gunzip(fastL.toByteArray()));
    }

    private static byte[] gunzip(byte[] gz) throws java.io.IOException {
        try (var in = new GZIPInputStream(new java.io.ByteArrayInputStream(gz))) {
            return in.readAllBytes();
        }
    }

    @Test
    void headerFieldsFollowNifti1() throws Exception {
        Geometry g = oblique();
        Path out = dir.resolve("h.nii.gz");
        NiftiWriter.writeLabels(out, LabelVolume.ofBytes(g, new byte[(int) g.voxelCount()]));
        byte[] raw;
        try (var in = new GZIPInputStream(Files.newInputStream(out))) {
            raw = in.readAllBytes();
        }
        ByteBuffer h = ByteBuffer.wrap(raw).order(ByteOrder.LITTLE_ENDIAN);
        // Offsets from nifti1.h (NIfTI Data Format Working Group).
        assertEquals(348, h.getInt(0));
        assertEquals(352f, h.getFloat(108));
        assertEquals(2, h.get(123)); // xyzt_units = NIFTI_UNITS_MM
        assertEquals('n', h.get(344));
        assertEquals('+', h.get(345));
        assertEquals('1', h.get(346));
        assertEquals(0, h.get(347));
        assertEquals(0.8f, h.getFloat(80));
        assertEquals(2.5f, h.getFloat(88));
        assertEquals(352 + g.voxelCount(), raw.length);
    }

    @Test
    void leftHandedGridGetsNegativeQfacAndSameQform() throws Exception {
        // x flipped (LAS-like): determinant negative.
        double[][] a = {
            {-1.5, 0, 0, 40},
            {0, 1.25, 0, -20},
            {0, 0, 3, 5},
            {0, 0, 0, 1}
        };
        Geometry g = new Geometry(new int[] {4, 3, 2}, new double[] {1.5, 1.25, 3}, a);
        double[] q = Quaternions.fromAffine(a);
        assertEquals(-1, q[3]);
        double[][] back = Quaternions.qformAffine(q[0], q[1], q[2], q[3], 1.5, 1.25, 3, 40, -20, 5);
        for (int r = 0; r < 4; r++) {
            assertArrayEquals(a[r], back[r], 1e-12);
        }
        Path out = dir.resolve("lh.nii");
        NiftiWriter.writeLabels(out, LabelVolume.ofBytes(g, new byte[24]));
        assertGeometryClose(g, new NiftiReader().readLabels(out, ReadLimits.DEFAULT).geometry(), 1e-6);
    }

    @Test
    void randomRotationsSurviveTheQuaternion() {
        Random rnd = new Random(11);
        for (int t = 0; t < 200; t++) {
            // Random rotation from a random unit quaternion (a, b, c, d), a >= 0.
            double[] q = {rnd.nextGaussian(), rnd.nextGaussian(), rnd.nextGaussian(), rnd.nextGaussian()};
            double n = Math.sqrt(q[0] * q[0] + q[1] * q[1] + q[2] * q[2] + q[3] * q[3]);
            double sign = q[0] < 0 ? -1 : 1;
            double[][] r = Quaternions.rotation(sign * q[1] / n, sign * q[2] / n, sign * q[3] / n);
            double qfac = rnd.nextBoolean() ? 1 : -1;
            double[] s = {0.5 + rnd.nextDouble(), 0.5 + rnd.nextDouble(), 0.5 + rnd.nextDouble()};
            double[][] a = new double[4][4];
            for (int i = 0; i < 3; i++) {
                for (int j = 0; j < 3; j++) {
                    a[i][j] = r[i][j] * s[j] * (j == 2 ? qfac : 1);
                }
            }
            a[3][3] = 1;
            double[] p = Quaternions.fromAffine(a);
            assertEquals(qfac, p[3]);
            double[][] back = Quaternions.qformAffine(p[0], p[1], p[2], p[3], s[0], s[1], s[2], 0, 0, 0);
            for (int i = 0; i < 3; i++) {
                assertArrayEquals(a[i], back[i], 1e-9, "trial " + t + " row " + i);
            }
        }
    }

    @Test
    void twoDimensionalGridRoundTrip() throws Exception {
        Geometry g = Geometry.axisAligned(4, 3, 1, 0.5, 0.25, 1);
        byte[] labels = {0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11};
        Path out = dir.resolve("flat.nii.gz");
        NiftiWriter.writeLabels(out, LabelVolume.ofBytes(g, labels.clone()));
        LabelVolume back = Volumes.readLabels(out, ReadLimits.DEFAULT);
        assertArrayEquals(labels, back.bytes());
        assertGeometryClose(g, back.geometry(), 0);
    }

    @Test
    void geometryAloneDoesNotReadThePayload() throws Exception {
        // A .nii.gz whose payload is cut short: the header-only read still succeeds, the full read fails.
        Geometry g = oblique();
        Path out = dir.resolve("whole.nii.gz");
        NiftiWriter.writeLabels(out, LabelVolume.ofBytes(g, new byte[(int) g.voxelCount()]));
        byte[] raw;
        try (var in = new GZIPInputStream(Files.newInputStream(out))) {
            raw = in.readAllBytes();
        }
        Path cut = TestFiles.write(dir.resolve("cut.nii.gz"), TestFiles.gzip(java.util.Arrays.copyOf(raw, 360)));
        assertGeometryClose(g, Volumes.readGeometry(cut, ReadLimits.DEFAULT), 1e-5);
        assertThrows(InputException.class, () -> Volumes.readLabels(cut, ReadLimits.DEFAULT));
    }

    @Test
    void payloadsSpanningSeveralChunksRoundTrip() throws Exception {
        // 1.2 million voxels: more than one 1 MiB chunk for uint8 and for uint16, raw and gzip.
        Geometry g = Geometry.axisAligned(150, 100, 80, 1, 1, 1);
        int n = (int) g.voxelCount();
        Random rnd = new Random(3);
        int[] wide = new int[n];
        byte[] narrow = new byte[n];
        for (int i = 0; i < n; i++) {
            wide[i] = rnd.nextInt(10) == 0 ? 256 + rnd.nextInt(60000) : rnd.nextInt(3);
            narrow[i] = (byte) rnd.nextInt(256);
        }
        for (String name : new String[] {"big.nii", "big.nii.gz"}) {
            Path w = dir.resolve("wide-" + name);
            NiftiWriter.writeLabels(w, LabelVolume.ofInts(g, wide.clone()));
            assertArrayEquals(wide, Volumes.readLabels(w, ReadLimits.DEFAULT).ints(), name);
            Path b = dir.resolve("narrow-" + name);
            NiftiWriter.writeLabels(b, LabelVolume.ofBytes(g, narrow.clone()));
            assertArrayEquals(narrow, Volumes.readLabels(b, ReadLimits.DEFAULT).bytes(), name);
        }
    }
}
