package org.accordia.io;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.zip.DeflaterOutputStream;
import java.util.zip.GZIPOutputStream;

/** Builders for small test files (also used by the hostile-input corpus). */
public final class TestFiles {
    private TestFiles() {
    }

    public static byte[] ascii(String s) {
        return s.getBytes(StandardCharsets.US_ASCII);
    }

    public static byte[] concat(byte[]... parts) {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        for (byte[] p : parts) {
            out.writeBytes(p);
        }
        return out.toByteArray();
    }

    public static byte[] gzip(byte[] data) throws IOException {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        try (GZIPOutputStream gz = new GZIPOutputStream(out)) {
            gz.write(data);
        }
        return out.toByteArray();
    }

    public static byte[] zlib(byte[] data) throws IOException {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        try (DeflaterOutputStream z = new DeflaterOutputStream(out)) {
            z.write(data);
        }
        return out.toByteArray();
    }

    public static byte[] shorts(ByteOrder order, int... values) {
        ByteBuffer b = ByteBuffer.allocate(2 * values.length).order(order);
        for (int v : values) {
            b.putShort((short) v);
        }
        return b.array();
    }

    public static byte[] floats(ByteOrder order, float... values) {
        ByteBuffer b = ByteBuffer.allocate(4 * values.length).order(order);
        for (float v : values) {
            b.putFloat(v);
        }
        return b.array();
    }

    public static byte[] bytes(int... values) {
        byte[] b = new byte[values.length];
        for (int i = 0; i < values.length; i++) {
            b[i] = (byte) values[i];
        }
        return b;
    }

    public static Path write(Path file, byte[] content) throws IOException {
        Files.createDirectories(file.toAbsolutePath().getParent());
        return Files.write(file, content);
    }
}
