package org.accordia.hostile;

import static org.accordia.hostile.HostileCorpusTest.run;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.accordia.hostile.HostileCorpusTest.Run;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * A run killed part-way ({@code destroyForcibly}, i.e. SIGKILL: no shutdown hook, no cleanup)
 * leaves no truncated file under a final name: every file present under a final name is
 * complete (CSVs parse and end with a newline, JSON parses, NIfTI volumes read, the HTML ends
 * with its closing tag), the report and summary are either absent or complete, and the only
 * incomplete files are our temporaries ({@code .NAME.partial-<hex>}), which the next run into the
 * folder removes. The run is killed at increasing delays until one finishes before its kill.
 */
class KilledRunTest {
    @TempDir
    Path tmp;

    static Process startAnalyze(Path study, Path out, Path logs, String... extra) throws IOException {
        List<String> cmd = new ArrayList<>(List.of(Path.of(System.getProperty("java.home"), "bin", "java").toString(),
            "-Xmx1g", "-Djava.awt.headless=true", "-cp", System.getProperty("java.class.path"), "org.accordia.cli.Main",
            "analyze", study.toString(), "--out", out.toString(), "--threads", "2"));
        cmd.addAll(Arrays.asList(extra));
        return new ProcessBuilder(cmd).redirectErrorStream(true).redirectOutput(logs.toFile()).start();
    }

    @Test
    void killedRunsLeaveOnlyCompleteFilesUnderFinalNames() throws Exception {
        Path study = tmp.resolve("study");
        Run demo = run("demo", "--out", study.toString(), "--size", "80,80,40", "--cases", "8");
        assertEquals(0, demo.code(), demo.err());

        int killedWhileWriting = 0;
        int kills = 0;
        boolean finished = false;
        for (long delayMs = 700; delayMs <= 12_000 && !finished; delayMs += 700) {
            Path out = tmp.resolve("out-" + delayMs);
            Process p = startAnalyze(study, out, tmp.resolve("log-" + delayMs + ".txt"));
            if (p.waitFor(delayMs, TimeUnit.MILLISECONDS)) {
                assertEquals(0, p.exitValue(), Files.readString(tmp.resolve("log-" + delayMs + ".txt")));
                finished = true;
            } else {
                p.destroyForcibly();
                assertTrue(p.waitFor(30, TimeUnit.SECONDS));
                kills++;
            }
            int complete = OutputChecks.assertEveryFinalFileComplete(out);
            boolean temporaries = OutputChecks.files(out).stream()
                .anyMatch(f -> OutputChecks.TEMPORARY.matcher(f.getFileName().toString()).matches());
            if (!finished && (complete > 0 || temporaries)) {
                killedWhileWriting++;
            }
            // the next run into the same folder completes and removes the killed run's temporaries
            Run again = run("analyze", study.toString(), "--out", out.toString(), "--force");
            assertEquals(0, again.code(), again.out() + again.err());
            assertTrue(OutputChecks.files(out).stream()
                .noneMatch(f -> OutputChecks.TEMPORARY.matcher(f.getFileName().toString()).matches()), "temporaries left");
            assertTrue(Files.exists(out.resolve("report.html")) && Files.exists(out.resolve("summary.json")));
            OutputChecks.assertEveryFinalFileComplete(out);
        }
        assertTrue(kills > 0, "no run was killed: the study is too small");
        System.out.printf("killed runs: %d, of which %d while writing outputs; last run finished: %s%n",
            kills, killedWhileWriting, finished);
    }

    /**
     * A forced rerun killed part-way over a complete earlier run: the earlier report and summary
     * are deleted first (so no old report sits beside new tables), and what remains under final
     * names is complete.
     */
    @Test
    void killedForcedRerunNeverLeavesAHalfReport() throws Exception {
        Path study = tmp.resolve("study");
        Run demo = run("demo", "--out", study.toString(), "--size", "80,80,40", "--cases", "8");
        assertEquals(0, demo.code(), demo.err());
        Path out = tmp.resolve("out");
        Run first = run("analyze", study.toString(), "--out", out.toString());
        assertEquals(0, first.code(), first.out() + first.err());
        byte[] report = Files.readAllBytes(out.resolve("report.html"));
        Process p = startAnalyze(study, out, tmp.resolve("log.txt"), "--force");
        if (!p.waitFor(1500, TimeUnit.MILLISECONDS)) {
            p.destroyForcibly();
            assertTrue(p.waitFor(30, TimeUnit.SECONDS));
        }
        Path html = out.resolve("report.html");
        if (Files.exists(html)) {
            byte[] now = Files.readAllBytes(html);
            assertFalse(now.length == 0, "empty report under its final name");
        }
        OutputChecks.assertEveryFinalFileComplete(out);
        assertTrue(report.length > 0);
    }
}
