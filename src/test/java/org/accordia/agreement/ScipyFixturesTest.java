package org.accordia.agreement;

import org.accordia.study.ReaderId;
import org.accordia.study.Structure;

import static org.junit.jupiter.api.Assertions.assertEquals;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.io.InputStream;
import java.util.ArrayList;
import java.util.List;
import java.util.stream.Stream;
import org.accordia.io.Geometry;
import org.accordia.io.LabelVolume;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * Surface distances and the raw distance transform against scipy: the reference values in
 * fixtures/agreement/expected.json were produced by fixtures/agreement/make_fixtures.py with
 * Debian's python3-scipy 1.10.1 / numpy 1.24.2 ({@code /usr/bin/python3 make_fixtures.py}):
 * {@code scipy.ndimage.distance_transform_edt(~border, sampling=spacing)}, border voxels by
 * {@code binary_erosion} with a cross structuring element and {@code border_value=0}, HD95 by
 * {@code numpy.percentile} (linear).
 */
class ScipyFixturesTest {
    private static final String DIR = "/fixtures/agreement/";
    private static final double REL = 1e-9;

    static JsonNode expected() throws IOException {
        try (InputStream in = ScipyFixturesTest.class.getResourceAsStream(DIR + "expected.json")) {
            return new ObjectMapper().readTree(in);
        }
    }

    static Stream<Arguments> cases() throws IOException {
        List<Arguments> out = new ArrayList<>();
        for (JsonNode c : expected().get("cases")) {
            out.add(Arguments.of(c.get("name").asText(), c));
        }
        return out.stream();
    }

    static byte[] mask(String file, int n) throws IOException {
        try (InputStream in = ScipyFixturesTest.class.getResourceAsStream(DIR + file)) {
            byte[] b = in.readAllBytes();
            assertEquals(n, b.length, file);
            return b;
        }
    }

    static void rel(double expected, double actual, String what) {
        assertEquals(expected, actual, REL * Math.max(1e-12, Math.abs(expected)), what);
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("cases")
    void pairMetricsMatchScipy(String name, JsonNode c) throws IOException {
        int nx = c.get("nx").asInt();
        int ny = c.get("ny").asInt();
        int nz = c.get("nz").asInt();
        double sx = c.get("spacing_mm").get(0).asDouble();
        double sy = c.get("spacing_mm").get(1).asDouble();
        double sz = c.get("spacing_mm").get(2).asDouble();
        double tol = c.get("tolerance_mm").asDouble();
        Geometry g = Geometry.axisAligned(nx, ny, nz, sx, sy, sz);
        byte[] a = mask(name + "_a.u8", nx * ny * nz);
        byte[] b = mask(name + "_b.u8", nx * ny * nz);
        List<CaseAgreement> res = new CaseAgreementEngine(tol).evaluate(name,
            List.of(new ReaderId("a", "x"), new ReaderId("b", "x")),
            List.of(LabelVolume.ofBytes(g, a.clone()), LabelVolume.ofBytes(g, b.clone())), List.of(Structure.of("s", 1)));
        PairMetrics p = res.get(0).pairs().get(0);
        assertEquals(c.get("voxels_a").asLong(), res.get(0).voxelCounts().get(0));
        assertEquals(c.get("voxels_b").asLong(), res.get(0).voxelCounts().get(1));
        rel(c.get("dice").asDouble(), p.dice(), "dice");
        rel(c.get("jaccard").asDouble(), p.jaccard(), "jaccard");
        rel(c.get("hd_mm").asDouble(), p.hdMm(), "hd");
        rel(c.get("hd95_mm").asDouble(), p.hd95Mm(), "hd95");
        rel(c.get("hd95_pooled_mm").asDouble(), p.hd95PooledMm(), "hd95 pooled");
        rel(c.get("assd_mm").asDouble(), p.assdMm(), "assd");
        rel(c.get("nsd").asDouble(), p.nsd(), "nsd");

        // raw transform checksum: distance to A's border voxels over the whole grid
        boolean[] fa = new boolean[a.length];
        for (int i = 0; i < a.length; i++) {
            fa[i] = a[i] != 0;
        }
        boolean[] border = Borders.borderMask(fa, nx, ny, nz);
        int count = 0;
        for (boolean v : border) {
            count += v ? 1 : 0;
        }
        assertEquals(c.get("border_a").asInt(), count, "border voxels of A");
        double[] d2 = DistanceTransform.squaredDistanceMm2(border, nx, ny, nz, sx, sy, sz);
        double sum = 0;
        double sumSq = 0;
        for (double v : d2) {
            sum += Math.sqrt(v);
            sumSq += v;
        }
        rel(c.get("edt_sum").asDouble(), sum, "edt sum");
        rel(c.get("edt_sum_sq").asDouble(), sumSq, "edt sum of squares");
    }
}
