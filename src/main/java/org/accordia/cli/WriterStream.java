package org.accordia.cli;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.OutputStream;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;

/** Bytes (UTF-8) to a PrintWriter, decoded at each flush: lets Progress write to picocli's err. */
final class WriterStream extends OutputStream {
    private final PrintWriter target;
    private final ByteArrayOutputStream pending = new ByteArrayOutputStream();

    WriterStream(PrintWriter target) {
        this.target = target;
    }

    @Override
    public synchronized void write(int b) {
        pending.write(b);
    }

    @Override
    public synchronized void write(byte[] b, int off, int len) {
        pending.write(b, off, len);
    }

    @Override
    public synchronized void flush() throws IOException {
        target.write(pending.toString(StandardCharsets.UTF_8));
        pending.reset();
        target.flush();
    }

    @Override
    public void close() throws IOException {
        flush();
    }
}
