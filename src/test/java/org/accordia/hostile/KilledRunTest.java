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
 * folder removes.
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

    /**
     * Waits until {@code out} holds a file newer than the start (or the process ends), then waits
     * {@code delayMs} more and kills the process. Returns whether it finished on its own.
     */
    static boolean killOnceWriting(Process p, Path out, long delayMs) throws Exception {
        long start = System.currentTimeMillis();
        long deadline = start + 60_000;
        while (System.currentTimeMillis() < deadline && p.isAlive()) {
            boolean fresh = false;
            for (Path f : OutputChecks.files(out)) {
                try {
                    if (Files.getLastModifiedTime(out.resolve(f)).toMillis() >= start - 1000) {
                        fresh = true;
                        break;
                    }
                } catch (java.nio.file.NoSuchFileException gone) {
                    // renamed or removed meanwhile
                }
            }
            if (fresh) {
                break;
            }
            Thread.sleep(10);
        }
        if (p.waitFor(delayMs, TimeUnit.MILLISECONDS)) {
            return true;
        }
        p.destroyForcibly();
        assertTrue(p.waitFor(30, TimeUnit.SECONDS));
        return false;
    }

    /**
     * Kills two runs, right after their first output file appears and 400 ms later (the cases'
     * consensus masks are being written), checks each folder, then completes a forced rerun into the second
     * folder (temporaries removed, other files kept) and kills a further forced rerun at 1.5 s:
     * the earlier complete report is deleted first, so the folder never shows an old report beside
     * new tables.
     */
    @Test
    void killedRunsLeaveOnlyCompleteFilesUnderFinalNames() throws Exception {
        Path study = tmp.resolve("study");
        Run demo = run("demo", "--out", study.toString(), "--size", "64,64,32", "--cases", "5", "--centres", "2", "--readers-per-centre", "2");
        assertEquals(0, demo.code(), demo.err());
        Files.writeString(study.resolve("protocol.yaml"), AnalyzeHostileTest.LIGHT);

        int killedWithFiles = 0;
        Path out = null;
        for (long afterFirstFileMs : new long[] {0, 400}) {
            out = tmp.resolve("out-" + afterFirstFileMs);
            Process p = startAnalyze(study, out, tmp.resolve("log-" + afterFirstFileMs + ".txt"));
            boolean finished = killOnceWriting(p, out, afterFirstFileMs);
            int complete = OutputChecks.assertEveryFinalFileComplete(out);
            if (!finished && !OutputChecks.files(out).isEmpty()) {
                killedWithFiles++;
            }
            System.out.printf("kill %d ms after the first output file: finished=%s, %d complete files, %d files in all%n",
                afterFirstFileMs, finished, complete, OutputChecks.files(out).size());
        }
        assertTrue(killedWithFiles > 0, "no run was killed while writing");

        // the next run into the folder (with --force) completes and removes the killed run's temporaries
        Files.createDirectories(out);
        Files.writeString(out.resolve("keep.txt"), "keep me\n");
        Run again = run("analyze", study.toString(), "--out", out.toString(), "--force", "--quiet");
        assertEquals(0, again.code(), again.out() + again.err());
        assertTrue(OutputChecks.files(out).stream()
            .noneMatch(f -> OutputChecks.TEMPORARY.matcher(f.getFileName().toString()).matches()), "temporaries left");
        assertTrue(Files.exists(out.resolve("report.html")) && Files.exists(out.resolve("summary.json")));
        assertEquals("keep me\n", Files.readString(out.resolve("keep.txt")), "--force keeps files it does not write");
        OutputChecks.assertEveryFinalFileComplete(out);

        // a forced rerun killed part-way: the complete report of the run before is deleted before anything
        // new is written, so the folder never shows the old report beside new files
        byte[] oldReport = Files.readAllBytes(out.resolve("report.html"));
        java.nio.file.attribute.FileTime oldTime = Files.getLastModifiedTime(out.resolve("report.html"));
        Process p = startAnalyze(study, out, tmp.resolve("log-forced.txt"), "--force");
        killOnceWriting(p, out, 200);
        Path html = out.resolve("report.html");
        if (Files.exists(html) && java.util.Arrays.equals(oldReport, Files.readAllBytes(html))) {
            for (Path f : OutputChecks.files(out)) {
                assertTrue(Files.getLastModifiedTime(out.resolve(f)).compareTo(oldTime) <= 0,
                    "the old report sits beside a new file " + f);
            }
        }
        OutputChecks.assertEveryFinalFileComplete(out);
        System.out.printf("killed runs that had written files: %d of 2%n", killedWithFiles);
    }
}
