package org.accordia.io;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * Oblique MetaImage and NRRD files written by ITK 5.2 (Debian libinsighttoolkit5-dev) and ITK's
 * own reading of them (src/test/resources/fixtures/itk/make_fixtures.cxx, expected.json). ITK's
 * world space is LPS and its direction matrix has the index axes' directions as columns, so the
 * RAS+ affine we expect is diag(-1, -1, 1) * [D * diag(spacing) | origin].
 */
class ItkFixturesTest {
    static final Path DIR = Path.of("src/test/resources/fixtures/itk");

    static Stream<JsonNode> fixtures() throws IOException {
        List<JsonNode> list = new ArrayList<>();
        new ObjectMapper().readTree(DIR.resolve("expected.json").toFile()).get("fixtures").forEach(list::add);
        return list.stream();
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("fixtures")
    void matchesItk(JsonNode fx) throws Exception {
        Path file = DIR.resolve(fx.get("file").asText());
        LabelVolume v = Volumes.readLabels(file, ReadLimits.DEFAULT);
        Geometry g = v.geometry();
        int[] dims = new int[3];
        double[] spacing = new double[3];
        for (int d = 0; d < 3; d++) {
            dims[d] = fx.get("size").get(d).asInt();
            spacing[d] = fx.get("spacing").get(d).asDouble();
        }
        assertArrayEquals(dims, g.dims());
        assertArrayEquals(spacing, g.spacingMm(), 1e-9);
        double[] toRas = {-1, -1, 1};
        for (int r = 0; r < 3; r++) {
            for (int c = 0; c < 3; c++) {
                double expected = toRas[r] * fx.get("direction_lps_rows").get(r).get(c).asDouble() * spacing[c];
                assertEquals(expected, g.affine(r, c), 1e-9, "affine[" + r + "][" + c + "]");
            }
            assertEquals(toRas[r] * fx.get("origin_lps").get(r).asDouble(), g.affine(r, 3), 1e-9);
        }
        double sum = 0;
        double weighted = 0;
        for (int i = 0; i < v.voxelCount(); i++) {
            sum += v.label(i);
            weighted += (double) i * v.label(i);
        }
        assertEquals(fx.get("sum").asDouble(), sum);
        assertEquals(fx.get("weighted_sum").asDouble(), weighted);
        assertEquals(g, Volumes.readGeometry(file, ReadLimits.DEFAULT));
    }
}
