package org.accordia.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.atomic.AtomicLong;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

class ProgressTest {

    static final long S = 1_000_000_000L;

    @Test
    void abandonedAfterAFailurePrintsNoLastLine() {
        ByteArrayOutputStream buf = new ByteArrayOutputStream();
        PrintStream err = new PrintStream(buf, true, StandardCharsets.UTF_8);
        AtomicLong clock = new AtomicLong(1000 * S);
        Progress p = Progress.create(3, false, err, false, clock::get);
        clock.addAndGet(S / 2);
        p.step();
        p.abandon();
        p.close(); // the try-with-resources close after abandon: nothing either
        assertEquals("", buf.toString(StandardCharsets.UTF_8));
    }

    @Test
    void plainLinesAtMostEveryTwoSecondsAndAtTheEnd() {
        ByteArrayOutputStream buf = new ByteArrayOutputStream();
        PrintStream err = new PrintStream(buf, true, StandardCharsets.UTF_8);
        AtomicLong clock = new AtomicLong(1000 * S);
        Progress p = Progress.create(10, false, err, false, clock::get);
        clock.addAndGet(S / 2);
        p.step();                 // 0.5 s: too early for a line
        clock.addAndGet(S);
        p.step();                 // 1.5 s
        clock.addAndGet(S / 2);
        p.step();                 // 2.0 s: 3 cases in 2 s -> 1.5 cases/s, 7 left -> about 5 s
        clock.addAndGet(S);
        p.step();                 // 3.0 s: within 2 s of the last line
        clock.addAndGet(S);
        p.step();                 // 4.0 s: 5 in 4 s -> 1.25, printed 1.3 (Formatter rounds half up), 4 s left
        for (int i = 0; i < 5; i++) {
            clock.addAndGet(S);
            p.step();
        }
        clock.addAndGet(3 * S);   // the study-level statistics take 3 s
        p.close();
        p.close(); // a second close does nothing
        List<String> lines = buf.toString(StandardCharsets.UTF_8).lines().toList();
        // times and rates worked out by hand from the fake clock
        assertEquals(List.of(
            "accordia: 3/10 cases (1.5 cases/s, about 5 s left)",
            "accordia: 5/10 cases (1.3 cases/s, about 4 s left)",
            "accordia: 7/10 cases (1.2 cases/s, about 3 s left)",
            "accordia: 9/10 cases (1.1 cases/s, about 1 s left)",
            "accordia: 10/10 cases (1.1 cases/s, took 9 s)",
            "accordia: " + Progress.STUDY_STAGE + "...",
            "accordia: study-level statistics took 3 s; writing the report"), lines);
    }

    @Test
    void aQuickRunNamesNoStageAndAFailedOnePrintsNothing() {
        ByteArrayOutputStream buf = new ByteArrayOutputStream();
        PrintStream err = new PrintStream(buf, true, StandardCharsets.UTF_8);
        AtomicLong clock = new AtomicLong(1000 * S);
        Progress p = Progress.create(2, false, err, false, clock::get);
        clock.addAndGet(S / 4);
        p.step();
        clock.addAndGet(S / 4);
        p.step();                 // all cases in 0.5 s: no line yet
        assertEquals("", buf.toString(StandardCharsets.UTF_8));
        p.abandon();              // the study-level statistics fail: the error's line stays the only one
        p.close();
        assertEquals("", buf.toString(StandardCharsets.UTF_8));

        Progress q = Progress.create(2, false, err, false, clock::get);
        q.step();
        q.step();
        q.close();
        assertEquals(List.of("accordia: 2/2 cases done"), buf.toString(StandardCharsets.UTF_8).lines().toList());
    }

    @Test
    void quietPrintsNothing() {
        ByteArrayOutputStream buf = new ByteArrayOutputStream();
        PrintStream err = new PrintStream(buf, true, StandardCharsets.UTF_8);
        AtomicLong clock = new AtomicLong();
        try (Progress p = Progress.create(3, true, err, false, clock::get)) {
            for (int i = 0; i < 3; i++) {
                clock.addAndGet(5 * S);
                p.step();
            }
        }
        try (Progress p = Progress.create(3, true, err, true, clock::get)) {
            p.step();
        }
        assertEquals("", buf.toString(StandardCharsets.UTF_8));
    }

    @Test
    void stepIsThreadSafe() throws Exception {
        ByteArrayOutputStream buf = new ByteArrayOutputStream();
        PrintStream err = new PrintStream(buf, true, StandardCharsets.UTF_8);
        AtomicLong clock = new AtomicLong();
        Progress p = Progress.create(8000, false, err, false, () -> clock.addAndGet(S / 1000));
        List<Thread> threads = new ArrayList<>();
        for (int t = 0; t < 8; t++) {
            threads.add(new Thread(() -> {
                for (int i = 0; i < 1000; i++) {
                    p.step();
                }
            }));
        }
        threads.forEach(Thread::start);
        for (Thread t : threads) {
            t.join();
        }
        p.close();
        assertEquals(8000, p.done());
        List<String> lines = buf.toString(StandardCharsets.UTF_8).lines().toList();
        assertTrue(lines.get(lines.size() - 3).startsWith("accordia: 8000/8000 cases"), lines.get(lines.size() - 3));
        assertEquals("accordia: " + Progress.STUDY_STAGE + "...", lines.get(lines.size() - 2));
    }

    @Test
    void terminalModeDrawsABarAndFinishes() {
        ByteArrayOutputStream buf = new ByteArrayOutputStream();
        PrintStream err = new PrintStream(buf, true, StandardCharsets.UTF_8);
        try (Progress p = Progress.create(4, false, err, true, System::nanoTime)) {
            for (int i = 0; i < 4; i++) {
                p.step();
            }
        }
        String out = buf.toString(StandardCharsets.UTF_8);
        assertTrue(out.contains("accordia"), out);
        assertTrue(out.contains("4/4"), out);
        assertTrue(out.contains(Progress.STUDY_STAGE), out);
    }

    @ParameterizedTest
    @CsvSource({"0, 0 s", "4.4, 4 s", "59.6, 1 min 00 s", "125, 2 min 05 s", "4020, 1 h 07 min"})
    void durationsForPeople(double seconds, String expected) {
        assertEquals(expected, Progress.duration(seconds));
    }
}
