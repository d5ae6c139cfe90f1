package org.accordia.cli;

import java.io.PrintStream;
import java.time.temporal.ChronoUnit;
import java.util.Locale;
import java.util.function.LongSupplier;
import me.tongfei.progressbar.ConsoleProgressBarConsumer;
import me.tongfei.progressbar.ProgressBar;
import me.tongfei.progressbar.ProgressBarBuilder;
import me.tongfei.progressbar.ProgressBarStyle;

/**
 * Progress of the per-case work on standard error.
 *
 * <ul>
 *   <li>On a terminal ({@code System.console() != null} and {@code TERM} is not {@code dumb}): a
 *       progress bar (me.tongfei:progressbar) with cases done, the rate in cases/s and the time left.</li>
 *   <li>Otherwise (a log file, CI, a pipe): plain lines such as
 *       {@code accordia: 3/10 cases (2.1 cases/s, about 4 s left)}, at most one every
 *       {@value #PLAIN_INTERVAL_SECONDS} seconds, and a last line when closed.</li>
 *   <li>{@code quiet}: nothing at all.</li>
 * </ul>
 * When the last case is done the case count is complete and the study-level stage is named
 * ({@value #STUDY_STAGE}), which can take a while on a large study; {@link #close()} then says how
 * long that stage took and that the report is being written. In plain-line mode this happens only
 * when the cases took at least {@value #PLAIN_INTERVAL_SECONDS} s (a run long enough to show
 * progress lines at all); a quicker run ends with its one last line, as before.
 * {@link #step()} may be called from any thread; {@link #close()} once when the cases are done
 * (further calls do nothing).
 */
public final class Progress implements AutoCloseable {
    /** Shortest time between two plain lines, in seconds. */
    public static final int PLAIN_INTERVAL_SECONDS = 2;
    /** The stage after the per-case work, as printed. */
    public static final String STUDY_STAGE = "study-level statistics (centre permutation test, variance components, "
        + "bootstrap intervals)";

    private final int total;
    private final PrintStream err;
    private final ProgressBar bar;
    private final boolean quiet;
    private final LongSupplier clockNanos;
    private final long startNanos;
    private long lastLineNanos;
    private int done;
    private boolean closed;
    private long casesDoneNanos = -1;

    private Progress(int total, boolean quiet, PrintStream err, boolean terminal, LongSupplier clockNanos) {
        if (total < 0) {
            throw new IllegalArgumentException("total cases must be >= 0, was " + total);
        }
        this.total = total;
        this.quiet = quiet;
        this.err = err;
        this.clockNanos = clockNanos;
        this.startNanos = clockNanos.getAsLong();
        this.lastLineNanos = startNanos;
        this.bar = quiet || !terminal ? null : new ProgressBarBuilder()
            .setTaskName("accordia")
            .setInitialMax(total)
            .setUnit(" cases", 1)
            .showSpeed()
            .setSpeedUnit(ChronoUnit.SECONDS)
            .setStyle(ProgressBarStyle.ASCII)
            .setUpdateIntervalMillis(500)
            .setConsumer(new ConsoleProgressBarConsumer(err))
            .build();
    }

    /**
     * Progress for {@code totalCases} cases on {@code err}: a bar on a terminal, plain lines
     * otherwise, nothing when {@code quiet}.
     */
    public static Progress create(int totalCases, boolean quiet, PrintStream err) {
        String term = System.getenv("TERM");
        boolean terminal = System.console() != null && !"dumb".equals(term);
        return create(totalCases, quiet, err, terminal, System::nanoTime);
    }

    /** As {@link #create(int, boolean, PrintStream)}, with the terminal decision and the clock given (tests). */
    static Progress create(int totalCases, boolean quiet, PrintStream err, boolean terminal, LongSupplier clockNanos) {
        return new Progress(totalCases, quiet, err, terminal, clockNanos);
    }

    /** One more case done. Thread-safe. */
    public synchronized void step() {
        if (quiet || closed) {
            return;
        }
        done++;
        long now = clockNanos.getAsLong();
        if (done == total && (bar != null || now - startNanos >= PLAIN_INTERVAL_SECONDS * 1_000_000_000L)) {
            // the case count is complete: say so, then name the stage that follows (plain lines only
            // on a run long enough for progress lines, so a quick run that fails still prints one line)
            if (bar != null) {
                bar.step();
                bar.close();
            } else {
                err.println(line(now, true));
            }
            casesDoneNanos = now;
            err.println("accordia: " + STUDY_STAGE + "...");
            err.flush();
            return;
        }
        if (bar != null) {
            bar.step();
            return;
        }
        if (now - lastLineNanos >= PLAIN_INTERVAL_SECONDS * 1_000_000_000L) {
            lastLineNanos = now;
            err.println(line(now, false));
            err.flush();
        }
    }

    /** Cases done so far. */
    public synchronized int done() {
        return done;
    }

    /**
     * Ends the display after a failure: a terminal bar is closed where it stopped, and no last
     * plain line is printed, so that the error's one line is the only line a failed run adds.
     * Further calls to {@link #close()} do nothing.
     */
    public synchronized void abandon() {
        if (closed) {
            return;
        }
        closed = true;
        if (bar != null && casesDoneNanos < 0) {
            bar.close();
        }
    }

    /** Ends the display: the bar is completed, or a last plain line is printed. */
    @Override
    public synchronized void close() {
        if (closed) {
            return;
        }
        closed = true;
        if (quiet) {
            return;
        }
        long now = clockNanos.getAsLong();
        if (casesDoneNanos >= 0) {
            err.println("accordia: study-level statistics took " + duration((now - casesDoneNanos) / 1e9)
                + "; writing the report");
        } else if (bar != null) {
            bar.close();
            return;
        } else {
            err.println(line(now, true));
        }
        err.flush();
    }

    private String line(long now, boolean last) {
        double seconds = (now - startNanos) / 1e9;
        StringBuilder sb = new StringBuilder("accordia: ").append(done).append('/').append(total).append(" cases");
        if (seconds <= 0 || done == 0) {
            return sb.append(last ? " done" : "").toString();
        }
        double rate = done / seconds;
        sb.append(" (").append(String.format(Locale.ROOT, "%.1f", rate)).append(" cases/s, ");
        if (last) {
            sb.append("took ").append(duration(seconds)).append(')');
        } else {
            sb.append("about ").append(duration((total - done) / rate)).append(" left)");
        }
        return sb.toString();
    }

    /** A duration for people: "4 s", "2 min 05 s", "1 h 07 min". */
    static String duration(double seconds) {
        long s = Math.round(Math.max(0, seconds));
        if (s < 60) {
            return s + " s";
        }
        if (s < 3600) {
            return String.format(Locale.ROOT, "%d min %02d s", s / 60, s % 60);
        }
        return String.format(Locale.ROOT, "%d h %02d min", s / 3600, (s % 3600) / 60);
    }
}
