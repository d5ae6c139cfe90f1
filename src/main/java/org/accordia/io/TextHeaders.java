package org.accordia.io;

import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/** Helpers shared by the text-header formats (NRRD, MetaImage). */
final class TextHeaders {
    /** The most header text read; a longer header is refused. */
    static final int MAX_HEADER_BYTES = 1 << 20;

    private TextHeaders() {
    }

    /** One header line: its text (without line end) and the file offset just after its line end. */
    record Line(String text, long end) {
    }

    /** The first bytes of a file (at most {@link #MAX_HEADER_BYTES}). */
    static byte[] head(Path file) throws InputException {
        InputFiles.requireRegular(file);
        try (InputStream in = Files.newInputStream(file)) {
            long size = Files.size(file);
            byte[] buf = new byte[(int) Math.min(size, MAX_HEADER_BYTES)];
            int n = Payload.readFully(in, buf, buf.length);
            return n == buf.length ? buf : java.util.Arrays.copyOf(buf, n);
        } catch (NoSuchFileException e) {
            throw new InputException(file, "file not found");
        } catch (IOException e) {
            throw new InputException(file, "cannot read: " + e.getMessage(), e);
        }
    }

    /** Splits bytes into lines ending in LF (a preceding CR is dropped); the last line may lack its LF. */
    static List<Line> lines(byte[] bytes, int max) {
        List<Line> out = new ArrayList<>();
        int start = 0;
        int n = Math.min(bytes.length, max);
        for (int i = 0; i < n; i++) {
            if (bytes[i] == '\n') {
                int end = i > start && bytes[i - 1] == '\r' ? i - 1 : i;
                out.add(new Line(new String(bytes, start, end - start, StandardCharsets.ISO_8859_1), i + 1));
                start = i + 1;
            }
        }
        if (start < n) {
            out.add(new Line(new String(bytes, start, n - start, StandardCharsets.ISO_8859_1), -1));
        }
        return out;
    }

    /**
     * The data file named by a detached header, resolved against the header's folder; refused when
     * it leaves that folder (by its name, or through a symbolic link: the containment is checked
     * on the real path) unless the limits allow it, and refused unless it is a regular file (a
     * named pipe, device, folder, dangling or looping link is never opened). Returns the real path.
     */
    static Path dataFile(Path header, String name, ReadLimits limits) throws InputException {
        Path folder = header.toAbsolutePath().normalize().getParent();
        Path data;
        try {
            data = folder.resolve(name).normalize();
        } catch (java.nio.file.InvalidPathException e) {
            throw new InputException(header, "invalid data file name \"" + name + "\"");
        }
        if (!data.startsWith(folder) && !limits.allowPathEscape()) {
            throw new InputException(header, "data file \"" + name + "\" lies outside the header's folder"
                + " (refused unless path escape is allowed)");
        }
        return InputFiles.realInside(data, folder, limits.allowPathEscape(), header, "data file");
    }

    /**
     * Factor converting a length unit to millimetres, or NaN when unknown. Accepts mm, cm, m,
     * um/µm/micron(s), nm, in/inch(es); case-insensitive.
     */
    static double unitToMm(String unit) {
        String u = unit.trim().toLowerCase(Locale.ROOT);
        return switch (u) {
            case "mm", "millimeter", "millimeters", "millimetre", "millimetres" -> 1.0;
            case "cm", "centimeter", "centimeters", "centimetre", "centimetres" -> 10.0;
            case "m", "meter", "meters", "metre", "metres" -> 1000.0;
            case "um", "\u00b5m", "\u03bcm", "micron", "microns", "micrometer", "micrometers", "micrometre", "micrometres" -> 0.001;
            case "nm", "nanometer", "nanometers", "nanometre", "nanometres" -> 1.0e-6;
            case "in", "inch", "inches" -> 25.4;
            default -> Double.NaN;
        };
    }

    static double parseDouble(Path file, String field, String text) throws InputException {
        String t = text.trim();
        try {
            if (t.equalsIgnoreCase("nan")) {
                return Double.NaN;
            }
            return Double.parseDouble(t);
        } catch (NumberFormatException e) {
            throw new InputException(file, field + ": \"" + t + "\" is not a number");
        }
    }

    static long parseLong(Path file, String field, String text) throws InputException {
        String t = text.trim();
        try {
            return Long.parseLong(t);
        } catch (NumberFormatException e) {
            throw new InputException(file, field + ": \"" + t + "\" is not an integer (or does not fit 64 bits)");
        }
    }

    static String[] words(String s) {
        String t = s.trim();
        return t.isEmpty() ? new String[0] : t.split("\\s+");
    }
}
