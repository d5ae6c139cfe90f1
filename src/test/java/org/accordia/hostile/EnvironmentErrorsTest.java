package org.accordia.hostile;

import static org.accordia.hostile.HostileCorpusTest.assertOneCleanErrLine;
import static org.accordia.hostile.HostileCorpusTest.run;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import org.accordia.hostile.HostileCorpusTest.Run;
import org.accordia.io.Messages;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Valid extremes of options and a hostile environment end with one line and exit code 2, never
 * with exit 1 ("internal error"): a huge {@code --threads}, an output path too long for the file
 * system, an output path under a regular file, {@code --out} leading into the study through a
 * symbolic link; and every message is one safe line.
 */
class EnvironmentErrorsTest {
    @TempDir
    static Path tmp;
    static Path study;

    @BeforeAll
    static void generate() {
        study = AnalyzeHostileTest.smallDemo(tmp.resolve("study"));
    }

    private static void refused(Run r, String... phrases) {
        assertEquals(2, r.code(), r.out() + r.err());
        assertOneCleanErrLine(r);
        for (String p : phrases) {
            assertTrue(r.err().contains(p), "\"" + p + "\" in: " + r.err());
        }
    }

    /** A usage error: the message on the first line, then where the help is (no stack trace, exit 2). */
    private static void usageError(Run r, String phrase) {
        assertEquals(2, r.code(), r.out() + r.err());
        assertTrue(r.err().lines().findFirst().orElse("").startsWith("accordia: ") && r.err().contains(phrase), r.err());
        assertFalse(r.err().contains("\tat ") || r.err().contains("Exception"), r.err());
    }

    @Test
    void hugeThreadCountsAreRefusedInEveryCommand() {
        usageError(run("analyze", study.toString(), "--out", tmp.resolve("o1").toString(), "--threads", "100000"),
            "--threads must be between 1 and 256 (got 100000)");
        usageError(run("inspect", study.toString(), "--threads", "100000"), "--threads must be between 1 and 256");
        usageError(run("demo", "--out", tmp.resolve("d").toString(), "--threads", "100000"), "--threads must be between 1 and 256");
        assertFalse(Files.exists(tmp.resolve("o1")));
        assertFalse(Files.exists(tmp.resolve("d")));
    }

    @Test
    void anOverlongOutputPathNamesTheFolder() {
        Path out = tmp.resolve("y".repeat(300));
        refused(run("analyze", study.toString(), "--out", out.toString(), "--quiet"), out.toString(), "File name too long");
        refused(run("demo", "--out", out.toString()), "File name too long");
    }

    @Test
    void anOutputPathUnderARegularFileIsRefused() throws Exception {
        Path file = Files.writeString(tmp.resolve("plain.txt"), "x");
        refused(run("analyze", study.toString(), "--out", file.resolve("out").toString(), "--quiet"), "plain.txt");
        refused(run("demo", "--out", file.resolve("demo").toString()), "plain.txt");
    }

    @Test
    void anOutputLinkIntoTheStudyIsRefusedAndNothingIsWritten() throws Exception {
        Path link = Files.createSymbolicLink(tmp.resolve("to-study"), study);
        Path linkInside = Files.createSymbolicLink(tmp.resolve("to-inside"), study.resolve("esterhaven"));
        long before;
        try (var s = Files.walk(study)) {
            before = s.count();
        }
        refused(run("analyze", study.toString(), "--out", link.toString(), "--force", "--quiet"), "study folder");
        refused(run("analyze", study.toString(), "--out", linkInside.resolve("report").toString(), "--quiet"), "study folder");
        refused(run("analyze", study.toString(), "--out", study.resolve("report").toString(), "--quiet"), "study folder");
        try (var s = Files.walk(study)) {
            assertEquals(before, s.count(), "the study is unchanged");
        }
    }

    @Test
    void messagesAreOneSafeLineOfBoundedLength() {
        assertEquals("a\\u001b[31mb\\u0000c d", Messages.oneLine("a\u001b[31mb\u0000c\nd"));
        assertEquals("x\\u202ey\\u0085", Messages.oneLine("x\u202ey\u0085"));
        String longText = "z".repeat(5000);
        String cut = Messages.oneLine(longText);
        assertEquals(Messages.MAX_CHARS, cut.indexOf("..."));
        assertTrue(cut.endsWith("... (4000 more characters)"), cut);
        // a control character in a manifest column name reaches the user escaped and cut
        Run r = run("inspect", "/proc/self/environ");
        assertEquals(2, r.code());
        assertOneCleanErrLine(r);
        assertFalse(r.err().contains("\u0000"), r.err());
        assertTrue(r.err().length() < 400, r.err());
    }
}
