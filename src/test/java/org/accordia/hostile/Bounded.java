package org.accordia.hostile;

import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.TimeoutException;

/**
 * Runs one fuzz input with a time bound, on a worker thread, rethrowing whatever the input
 * threw. A JUnit {@code @Timeout} cannot do this for fuzz tests: in fuzzing mode the whole
 * fuzzing run is one test invocation. A hang becomes an {@link AssertionError} (a finding).
 */
public final class Bounded implements AutoCloseable {
    /**
     * Seconds one input may take; far above the milliseconds a tiny input needs, and above the
     * 10 s that a few replayed inputs exceeded (never reproducibly) on a machine with a load
     * average of 28 on 2 cores.
     */
    public static final long SECONDS = 30;
    /**
     * Seconds the first input may take: it also loads and (in fuzzing mode) instruments every
     * reader class, which took 11 to 16 s on a machine with a load average of 38.
     */
    public static final long FIRST_SECONDS = 120;

    private boolean warm;

    private final ExecutorService worker = Executors.newSingleThreadExecutor(r -> {
        Thread t = new Thread(r, "accordia-fuzz-input");
        t.setDaemon(true);
        return t;
    });

    /** Something that may throw anything. */
    @FunctionalInterface
    public interface Body {
        void run() throws Exception;
    }

    /**
     * Runs {@code body}; a checked exception it throws is wrapped in an
     * {@link IllegalStateException}, a runtime exception or error is rethrown as is.
     */
    public void run(Body body) {
        Future<?> f = worker.submit(() -> {
            body.run();
            return null;
        });
        long bound = warm ? SECONDS : FIRST_SECONDS;
        warm = true;
        try {
            f.get(bound, TimeUnit.SECONDS);
        } catch (TimeoutException e) {
            f.cancel(true);
            throw new AssertionError("input took more than " + bound + " s (a hang)");
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException(e);
        } catch (ExecutionException e) {
            Throwable c = e.getCause();
            if (c instanceof RuntimeException re) {
                throw re;
            }
            if (c instanceof Error err) {
                throw err;
            }
            throw new IllegalStateException("unexpected checked exception: " + c, c);
        }
    }

    @Override
    public void close() {
        worker.shutdownNow();
    }
}
