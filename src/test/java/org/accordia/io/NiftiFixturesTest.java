package org.accordia.io;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.util.ArrayList;
import java.util.HexFormat;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * Reads every NIfTI fixture written by nibabel and compares with what nibabel reports
 * (fixtures and expected.json made by src/test/resources/fixtures/nifti/make_fixtures.py with
 * Debian's python3-nibabel 5.0.0). nibabel's affine is in the file's own unit; our convention is
 * mm, so the expected affine and zooms are multiplied by the recorded unit factor (metre 1000,
 * micron 0.001, unknown/mm 1).
 */
class NiftiFixturesTest {
    static final Path DIR = Path.of("src/test/resources/fixtures/nifti");

    static JsonNode expected() throws IOException {
        return new ObjectMapper().readTree(DIR.resolve("expected.json").toFile());
    }

    static Stream<JsonNode> fixtures() throws IOException {
        List<JsonNode> list = new ArrayList<>();
        expected().get("fixtures").forEach(list::add);
        return list.stream();
    }

    static Stream<JsonNode> javaWritten() throws IOException {
        List<JsonNode> list = new ArrayList<>();
        expected().get("java_written").forEach(list::add);
        return list.stream();
    }

    static double[][] matrix(JsonNode rows) {
        double[][] m = new double[4][4];
        for (int r = 0; r < 4; r++) {
            for (int c = 0; c < 4; c++) {
                m[r][c] = rows.get(r).get(c).asDouble();
            }
        }
        return m;
    }

    /** sum, weighted sum (i * value), min, max over the x-fastest order, as the script computes them. */
    static double[] sums(int n, java.util.function.IntToDoubleFunction value) {
        double sum = 0;
        double weighted = 0;
        double min = Double.POSITIVE_INFINITY;
        double max = Double.NEGATIVE_INFINITY;
        for (int i = 0; i < n; i++) {
            double v = value.applyAsDouble(i);
            sum += v;
            weighted += i * v;
            min = Math.min(min, v);
            max = Math.max(max, v);
        }
        return new double[] {sum, weighted, min, max};
    }

    static String sha256Uint32(LabelVolume v) throws Exception {
        ByteBuffer bb = ByteBuffer.allocate(4 * v.voxelCount()).order(ByteOrder.LITTLE_ENDIAN);
        for (int i = 0; i < v.voxelCount(); i++) {
            bb.putInt(v.label(i));
        }
        return HexFormat.of().formatHex(MessageDigest.getInstance("SHA-256").digest(bb.array()));
    }

    static void assertChecksums(JsonNode c, double[] s, double tol) {
        assertEquals(c.get("sum").asDouble(), s[0], tol, "sum");
        assertEquals(c.get("weighted_sum").asDouble(), s[1], tol * 100, "weighted sum");
        assertEquals(c.get("min").asDouble(), s[2], tol, "min");
        assertEquals(c.get("max").asDouble(), s[3], tol, "max");
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("fixtures")
    void matchesNibabel(JsonNode fx) throws Exception {
        Path file = DIR.resolve(fx.get("file").asText());
        double unit = fx.get("unit_to_mm").asDouble();
        Geometry g;
        if (fx.get("is_label").asBoolean()) {
            LabelVolume v = Volumes.readLabels(file, ReadLimits.DEFAULT);
            g = v.geometry();
            assertChecksums(fx.get("checksums"), sums(v.voxelCount(), v::label), 0);
            assertEquals(fx.get("checksums").get("sha256_uint32le").asText(), sha256Uint32(v));
        } else {
            ImageVolume v = Volumes.readImage(file, ReadLimits.DEFAULT);
            g = v.geometry();
            assertChecksums(fx.get("checksums"), sums(v.data().length, i -> v.data()[i]), 1e-4);
        }
        int[] dims = {1, 1, 1};
        for (int d = 0; d < fx.get("shape").size(); d++) {
            dims[d] = fx.get("shape").get(d).asInt();
        }
        assertArrayEquals(dims, g.dims());
        for (int d = 0; d < fx.get("zooms").size(); d++) {
            assertEquals(Math.abs(fx.get("zooms").get(d).asDouble()) * unit, g.spacing(d), 1e-5 * Math.max(1, unit), "spacing " + d);
        }
        double[][] expected = matrix(fx.get("affine"));
        for (int r = 0; r < 3; r++) {
            for (int c = 0; c < 4; c++) {
                assertEquals(expected[r][c] * unit, g.affine(r, c), 1e-5, "affine[" + r + "][" + c + "]");
            }
        }
        // Header-only read gives the same geometry without the payload.
        assertEquals(g, Volumes.readGeometry(file, ReadLimits.DEFAULT));
    }

    /** Files written by NiftiWriter, as nibabel reads them (see NiftiWriterFixtures). */
    @ParameterizedTest(name = "{0}")
    @MethodSource("javaWritten")
    void nibabelReadsOurWriterAsIntended(JsonNode fx) throws Exception {
        String name = fx.get("file").asText();
        Geometry g;
        double[] s;
        String dtype;
        if (name.equals("java_oblique_uint8.nii.gz")) {
            LabelVolume v = NiftiWriterFixtures.obliqueUint8();
            g = v.geometry();
            s = sums(v.voxelCount(), v::label);
            dtype = "uint8";
            assertEquals(fx.get("checksums").get("sha256_uint32le").asText(), sha256Uint32(v));
        } else if (name.equals("java_lefthanded_uint16.nii.gz")) {
            LabelVolume v = NiftiWriterFixtures.leftHandedUint16();
            g = v.geometry();
            s = sums(v.voxelCount(), v::label);
            dtype = "uint16";
            assertEquals(fx.get("checksums").get("sha256_uint32le").asText(), sha256Uint32(v));
        } else {
            g = NiftiWriterFixtures.shearedGeometry();
            float[] values = NiftiWriterFixtures.shearedValues();
            s = sums(values.length, i -> values[i]);
            dtype = "float32";
        }
        assertEquals(dtype, fx.get("dtype").asText());
        assertChecksums(fx.get("checksums"), s, 1e-9);
        assertEquals(1, fx.get("sform_code").asInt());
        assertEquals(1, fx.get("qform_code").asInt());
        assertEquals(352, fx.get("vox_offset").asInt());
        assertEquals("mm", fx.get("space_unit").asText());
        for (int d = 0; d < 3; d++) {
            assertEquals(g.dims()[d], fx.get("shape").get(d).asInt());
            assertEquals(g.spacing(d), fx.get("zooms").get(d).asDouble(), 1e-6);
        }
        double[][] a = g.affine();
        double[][] sform = matrix(fx.get("sform"));
        double[][] qform = matrix(fx.get("qform"));
        // The qform we intended: nearest rotation, our spacing, qfac from the determinant.
        double[] q = Quaternions.fromAffine(a);
        double[][] intended = Quaternions.qformAffine(q[0], q[1], q[2], q[3], g.spacing(0), g.spacing(1), g.spacing(2),
            a[0][3], a[1][3], a[2][3]);
        assertEquals(q[3], fx.get("qfac").asDouble());
        for (int r = 0; r < 4; r++) {
            assertArrayEquals(a[r], sform[r], 1e-6, "sform row " + r);
            assertArrayEquals(intended[r], qform[r], 1e-6, "qform row " + r);
        }
        if (!name.contains("sheared")) {
            for (int r = 0; r < 4; r++) {
                assertArrayEquals(a[r], qform[r], 1e-6, "a rigid grid's qform equals its affine, row " + r);
            }
        }
        // And our reader agrees with nibabel on our own file.
        Geometry back = Volumes.readGeometry(DIR.resolve(name), ReadLimits.DEFAULT);
        for (int r = 0; r < 4; r++) {
            assertArrayEquals(sform[r], back.affine()[r], 1e-9);
        }
    }

    @Test
    void everyFixtureIsSmall() throws IOException {
        try (var files = java.nio.file.Files.list(DIR)) {
            files.filter(p -> p.toString().contains(".nii")).forEach(p -> {
                try {
                    assertEquals(true, java.nio.file.Files.size(p) < 20_000, p + " is under 20 KB");
                } catch (IOException e) {
                    throw new java.io.UncheckedIOException(e);
                }
            });
        }
    }
}
