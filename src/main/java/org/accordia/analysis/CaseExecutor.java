package org.accordia.analysis;

import java.io.IOException;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.Semaphore;
import java.util.concurrent.atomic.AtomicReference;
import org.accordia.io.InputException;

/**
 * Runs the per-case unit over a study's cases. Today's implementation is the bounded local pool
 * ({@link #local}); another runner (e.g. a cluster) implements the same contract: call
 * {@code task} once for every index, let at most a bounded number of cases be in memory at once,
 * stop starting cases after the first failure and rethrow it. Results are written by index, so
 * they do not depend on the order in which cases finish.
 */
@FunctionalInterface
public interface CaseExecutor {

    /** The work on one case, by its index in the study's case list. */
    @FunctionalInterface
    interface CaseTask {
        void run(int index) throws InputException, IOException;
    }

    /**
     * Runs {@code task} for every index in [0, count).
     *
     * @throws InputException the first bad input met
     * @throws IOException the first output failure met
     */
    void forEachCase(int count, CaseTask task) throws InputException, IOException;

    /**
     * A pool of {@code threads} local workers; a case is only started when fewer than
     * {@code threads} cases are in flight (semaphore), so at most that many cases are in memory.
     * The first failure stops new cases and is rethrown.
     */
    static CaseExecutor local(int threads) {
        if (threads < 1) {
            throw new IllegalArgumentException("threads must be at least 1");
        }
        return (count, task) -> {
            int workers = Math.max(1, Math.min(threads, count));
            ExecutorService pool = Executors.newFixedThreadPool(workers, r -> {
                Thread t = new Thread(r, "accordia-analyze");
                t.setDaemon(true);
                return t;
            });
            Semaphore inFlight = new Semaphore(workers);
            AtomicReference<Throwable> failure = new AtomicReference<>();
            List<Future<?>> futures = new ArrayList<>();
            try {
                for (int i = 0; i < count && failure.get() == null; i++) {
                    inFlight.acquire();
                    int index = i;
                    futures.add(pool.submit(() -> {
                        try {
                            if (failure.get() == null) {
                                task.run(index);
                            }
                        } catch (Throwable t) {
                            failure.compareAndSet(null, t);
                        } finally {
                            inFlight.release();
                        }
                    }));
                }
                for (Future<?> f : futures) {
                    f.get();
                }
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                throw new IllegalStateException("analysis interrupted", e);
            } catch (ExecutionException e) {
                failure.compareAndSet(null, e.getCause());
            } finally {
                pool.shutdownNow();
            }
            Failures.rethrow(failure.get());
        };
    }
}
