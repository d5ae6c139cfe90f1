package org.accordia.report;

import java.io.IOException;

/** A consumer that may throw {@link IOException}: the body that writes one output file. */
@FunctionalInterface
public interface IOConsumer<T> {
    void accept(T value) throws IOException;
}
