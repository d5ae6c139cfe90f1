package org.accordia.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The golden snapshot: {@code accordia analyze demo-masks} at a fixed seed must reproduce the
 * committed CSV tables and summary.json byte for byte (src/test/resources/golden/demo-masks/).
 *
 * <p>Only one field is normalised before comparing: summary.json's {@code "version"} (the
 * build's version) becomes {@code "<version>"}. Nothing else in these files names the run time,
 * the machine or an absolute path (input paths are relative to the study root).
 *
 * <p>A change that alters outputs on purpose regenerates the snapshot with
 * <pre>
 * mvn -B -o -q test -Dtest=GoldenSnapshotTest -Daccordia.golden.update=true
 * </pre>
 * and says in its commit which outputs changed and why (DEVELOPERS.md).
 */
class GoldenSnapshotTest {
    /** Where the snapshot lives (the test runs from the project folder). */
    static final Path GOLDEN = Path.of("src/test/resources/golden/demo-masks");
    /** The files compared. */
    static final List<String> FILES = List.of("pairs.csv", "readers.csv", "centres.csv", "cases.csv",
        "reader_summary.csv", "events.csv", "summary.json");
    static final String SEED = "20261202";

    @Test
    void demoOutputsMatchTheSnapshot(@TempDir Path tmp) throws Exception {
        Path out = tmp.resolve("out");
        CliRun r = CliRun.of("analyze", "demo-masks", "--seed", SEED, "--threads", "2", "--quiet",
            "--out", out.toString());
        assertEquals(ExitCodes.OK, r.code(), r.err());
        boolean update = Boolean.getBoolean("accordia.golden.update");
        if (update) {
            Files.createDirectories(GOLDEN);
        }
        StringBuilder diffs = new StringBuilder();
        for (String f : FILES) {
            String actual = normalise(f, Files.readString(out.resolve(f), StandardCharsets.UTF_8));
            Path golden = GOLDEN.resolve(f);
            if (update) {
                Files.writeString(golden, actual, StandardCharsets.UTF_8);
                continue;
            }
            assertTrue(Files.isRegularFile(golden), "no snapshot " + golden + "; regenerate it (DEVELOPERS.md)");
            String expected = Files.readString(golden, StandardCharsets.UTF_8);
            if (!expected.equals(actual)) {
                diffs.append(firstDifference(f, expected, actual)).append('\n');
            }
        }
        if (diffs.length() > 0) {
            fail("outputs differ from the golden snapshot (src/test/resources/golden/demo-masks). If the change is "
                + "intended, regenerate with: mvn -B -o -q test -Dtest=GoldenSnapshotTest "
                + "-Daccordia.golden.update=true, and say in the commit which outputs changed and why.\n" + diffs);
        }
    }

    /** The build's version is the only run-dependent field of these files. */
    static String normalise(String file, String text) {
        if (file.equals("summary.json")) {
            return text.replaceFirst("\"version\": \"[^\"]*\"", "\"version\": \"<version>\"");
        }
        return text;
    }

    static String firstDifference(String file, String expected, String actual) {
        String[] e = expected.split("\n", -1);
        String[] a = actual.split("\n", -1);
        for (int i = 0; i < Math.max(e.length, a.length); i++) {
            String x = i < e.length ? e[i] : "<end of file>";
            String y = i < a.length ? a[i] : "<end of file>";
            if (!x.equals(y)) {
                return file + " line " + (i + 1) + ":\n  expected: " + x + "\n  actual:   " + y;
            }
        }
        return file + ": differs";
    }
}
