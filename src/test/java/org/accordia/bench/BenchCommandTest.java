package org.accordia.bench;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.accordia.cli.Main;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Runs {@code accordia bench} on a tiny study only to check that it completes, caches its study
 * and prints every ratio with its target. No assertion on any time or ratio value (wall time on a
 * shared machine is not a property of the code).
 */
class BenchCommandTest {

    private static String[] run(String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int code = Main.execute(new PrintWriter(out), new PrintWriter(err), args);
        return new String[] {Integer.toString(code), out.toString(), err.toString()};
    }

    @Test
    void tinyRunPrintsRatiosAndReusesTheStudy(@TempDir Path work) throws Exception {
        String[] r = run("bench", "--what", "all", "--cases", "2", "--size", "24,24,12", "--spacing", "1,1,2",
            "--rounds", "1", "--warmup", "0", "--threads", "2", "--work", work.toString(),
            "--analyze-cases", "2", "--analyze-rounds", "1", "--memory-cases", "2,3", "--child-xmx", "256m");
        assertEquals("0", r[0], r[2] + r[1]);
        String out = r[1];
        assertTrue(out.contains("generated in"), out);
        assertTrue(out.contains("load average"), out);
        for (String label : new String[] {"agreement: 36 pairs", "consensus, histogram parts", "consensus, voxel parts"}) {
            Matcher m = Pattern.compile(Pattern.quote(label) + ".*?([0-9.]+|NaN|Infinity)x").matcher(out);
            assertTrue(m.find(), "no ratio printed for " + label + ":\n" + out);
        }
        assertTrue(out.contains("<= 1.0x") && out.contains("<= 0.2x"), out);
        assertTrue(out.contains("end-to-end analyze / read"), out);
        assertTrue(out.contains("<= 3.0x"), out);
        assertTrue(out.contains("peak resident memory"), out);
        assertTrue(out.contains("within 20%"), out);
        try (var s = Files.list(work)) {
            assertTrue(s.anyMatch(p -> Files.isRegularFile(p.resolve(BenchStudies.SPEC_FILE))), "study not cached");
        }
        String[] again = run("bench", "--what", "agreement", "--cases", "2", "--size", "24,24,12", "--spacing",
            "1,1,2", "--rounds", "1", "--warmup", "0", "--work", work.toString());
        assertEquals("0", again[0], again[2]);
        assertTrue(again[1].contains("(cached)"), again[1]);
    }

    @Test
    void badSizeIsAUsageError(@TempDir Path work) {
        String[] r = run("bench", "--size", "24,24", "--work", work.toString());
        assertEquals("2", r[0]);
    }
}
