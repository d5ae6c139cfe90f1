package org.accordia.analysis;

import java.io.IOException;
import org.accordia.io.InputException;

/** Rethrowing the failure of a task run on another thread as what it was. */
public final class Failures {
    private Failures() {
    }

    /**
     * Throws {@code cause} itself when it is an {@link InputException}, {@link IOException},
     * {@link RuntimeException} or {@link Error}, else an {@link IllegalStateException} around it;
     * returns normally only when {@code cause} is null.
     */
    public static void rethrow(Throwable cause) throws InputException, IOException {
        if (cause == null) {
            return;
        }
        if (cause instanceof InputException ie) {
            throw ie;
        }
        if (cause instanceof IOException io) {
            throw io;
        }
        if (cause instanceof RuntimeException re) {
            throw re;
        }
        if (cause instanceof Error err) {
            throw err;
        }
        throw new IllegalStateException(cause);
    }

    /** As {@link #rethrow(Throwable)} for tasks that can only fail unchecked. */
    public static void rethrowUnchecked(Throwable cause) {
        try {
            rethrow(cause);
        } catch (InputException | IOException e) {
            throw new IllegalStateException(e);
        }
    }
}
