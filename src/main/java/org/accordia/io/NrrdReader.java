package org.accordia.io;

import java.io.IOException;
import java.io.InputStream;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * Reads NRRD volumes: {@code .nrrd} with attached header and {@code .nhdr} detached headers.
 *
 * <p>Follows the NRRD file format specification ("NRRD: Nearly Raw Raster Data", Teem project,
 * format versions NRRD0001..NRRD0005). Supported: every scalar type spelling; encodings raw and
 * gzip/gz (others refused); endian little/big; {@code space} RAS, LAS, LPS (with or without time)
 * plus scanner-xyz / 3D-right-handed taken as RAS; {@code space dimension}; {@code space
 * directions} (with {@code none} for non-spatial axes, which must have exactly one sample);
 * {@code space origin}; {@code space units}; {@code spacings} when there are no directions
 * (missing or NaN spacing = 1 mm); {@code data file} (one file, relative to the header's folder,
 * refused if it leaves that folder unless {@link ReadLimits#allowPathEscape()}); {@code line skip}
 * (lines of the raw data file, before decompression); {@code byte skip} (after decompression for
 * gzip, as Teem does; -1 = data at the end of a raw file). World coordinates in LPS or LAS are
 * converted to RAS+ by negating the affected rows of the affine.
 */
public final class NrrdReader implements VolumeReader {
    @Override
    public String formatName() {
        return "NRRD";
    }

    @Override
    public boolean accepts(Path file) {
        String name = file.getFileName().toString().toLowerCase(Locale.ROOT);
        return name.endsWith(".nrrd") || name.endsWith(".nhdr");
    }

    @Override
    public LabelVolume readLabels(Path file, ReadLimits limits) throws InputException {
        Header h = readHeader(file, limits);
        return Payload.readLabels(file, h.layout(), h.geometry(), false, 1, 0);
    }

    @Override
    public ImageVolume readImage(Path file, ReadLimits limits) throws InputException {
        Header h = readHeader(file, limits);
        return Payload.readImage(file, h.layout(), h.geometry(), false, 1, 0);
    }

    @Override
    public Geometry readGeometry(Path file, ReadLimits limits) throws InputException {
        return readHeader(file, limits).geometry();
    }

    @Override
    public long bytesRead(Path file, ReadLimits limits) throws InputException {
        Header h = readHeader(file, limits);
        return Payload.bytesRead(file, h.layout(), h.geometry().voxelCount());
    }

    record Header(Geometry geometry, Payload.Layout layout) {
    }

    static SampleType sampleType(String spelling) {
        String t = spelling.trim().toLowerCase(Locale.ROOT).replaceAll("\\s+", " ");
        return switch (t) {
            case "signed char", "int8", "int8_t" -> SampleType.INT8;
            case "uchar", "unsigned char", "uint8", "uint8_t" -> SampleType.UINT8;
            case "short", "short int", "signed short", "signed short int", "int16", "int16_t" -> SampleType.INT16;
            case "ushort", "unsigned short", "unsigned short int", "uint16", "uint16_t" -> SampleType.UINT16;
            case "int", "signed int", "int32", "int32_t" -> SampleType.INT32;
            case "uint", "unsigned int", "uint32", "uint32_t" -> SampleType.UINT32;
            case "longlong", "long long", "long long int", "signed long long", "signed long long int", "int64", "int64_t"
                -> SampleType.INT64;
            case "ulonglong", "unsigned long long", "unsigned long long int", "uint64", "uint64_t" -> SampleType.UINT64;
            case "float" -> SampleType.FLOAT32;
            case "double" -> SampleType.FLOAT64;
            default -> null;
        };
    }

    static Header readHeader(Path file, ReadLimits limits) throws InputException {
        byte[] head = TextHeaders.head(file);
        List<TextHeaders.Line> lines = TextHeaders.lines(head, head.length);
        if (lines.isEmpty() || !lines.get(0).text().startsWith("NRRD")) {
            throw new InputException(file, "bad magic: a NRRD file starts with \"NRRD000x\"");
        }
        String magic = lines.get(0).text().trim();
        if (!magic.matches("NRRD000[1-5]") && !magic.equals("NRRD00.01")) {
            throw new InputException(file, "unsupported NRRD version \"" + magic + "\" (NRRD0001..NRRD0005 are read)");
        }
        Map<String, String> fields = new HashMap<>();
        long dataStart = -1;
        for (int i = 1; i < lines.size(); i++) {
            TextHeaders.Line line = lines.get(i);
            String text = line.text();
            if (text.isEmpty()) {
                dataStart = line.end();
                break;
            }
            if (line.end() < 0 && head.length == TextHeaders.MAX_HEADER_BYTES) {
                throw new InputException(file, "header longer than " + TextHeaders.MAX_HEADER_BYTES + " bytes");
            }
            if (text.startsWith("#") || text.contains(":=")) {
                continue; // comment or key/value pair
            }
            int colon = text.indexOf(": ");
            if (colon <= 0) {
                throw new InputException(file, "malformed header line " + (i + 1) + ": \"" + clip(text) + "\"");
            }
            String key = text.substring(0, colon).trim().toLowerCase(Locale.ROOT);
            key = switch (key) {
                case "datafile" -> "data file";
                case "lineskip" -> "line skip";
                case "byteskip" -> "byte skip";
                default -> key;
            };
            if (fields.put(key, text.substring(colon + 2).trim()) != null) {
                throw new InputException(file, "field \"" + key + "\" is given twice");
            }
        }
        boolean detached = fields.containsKey("data file");
        if (!detached && dataStart < 0) {
            throw new InputException(file, head.length == TextHeaders.MAX_HEADER_BYTES
                ? "header longer than " + TextHeaders.MAX_HEADER_BYTES + " bytes"
                : "truncated header: no blank line before the data and no \"data file\" field");
        }

        int dimension = (int) Math.min(Integer.MAX_VALUE, TextHeaders.parseLong(file, "dimension", require(file, fields, "dimension")));
        if (dimension < 1 || dimension > 16) {
            throw new InputException(file, "dimension " + dimension + " out of range 1..16");
        }
        String typeText = require(file, fields, "type");
        SampleType type = sampleType(typeText);
        if (type == null) {
            throw new InputException(file, "unsupported type \"" + typeText + "\"");
        }
        String[] sizeWords = TextHeaders.words(require(file, fields, "sizes"));
        if (sizeWords.length != dimension) {
            throw new InputException(file, "sizes lists " + sizeWords.length + " values for dimension " + dimension);
        }
        long[] sizes = new long[dimension];
        for (int i = 0; i < dimension; i++) {
            sizes[i] = TextHeaders.parseLong(file, "sizes", sizeWords[i]);
        }
        Payload.voxelCount(file, sizes, limits);

        String encoding = require(file, fields, "encoding").toLowerCase(Locale.ROOT);
        Payload.Compression compression = switch (encoding) {
            case "raw" -> Payload.Compression.RAW;
            case "gzip", "gz" -> Payload.Compression.GZIP;
            default -> throw new InputException(file, "unsupported encoding \"" + encoding + "\" (raw and gzip are read)");
        };
        ByteOrder order = ByteOrder.LITTLE_ENDIAN;
        String endian = fields.get("endian");
        if (endian != null) {
            order = switch (endian.toLowerCase(Locale.ROOT)) {
                case "little" -> ByteOrder.LITTLE_ENDIAN;
                case "big" -> ByteOrder.BIG_ENDIAN;
                default -> throw new InputException(file, "endian must be little or big, found \"" + endian + "\"");
            };
        } else if (type.bytes() > 1) {
            throw new InputException(file, "missing endian field (required for " + typeText + " data)");
        }

        Geometry geometry = geometry(file, fields, dimension, sizes);

        long lineSkip = fields.containsKey("line skip") ? TextHeaders.parseLong(file, "line skip", fields.get("line skip")) : 0;
        long byteSkip = fields.containsKey("byte skip") ? TextHeaders.parseLong(file, "byte skip", fields.get("byte skip")) : 0;
        if (lineSkip < 0) {
            throw new InputException(file, "line skip " + lineSkip + " is negative");
        }
        if (byteSkip < -1) {
            throw new InputException(file, "byte skip " + byteSkip + " is below -1");
        }
        if (byteSkip == -1 && compression != Payload.Compression.RAW) {
            throw new InputException(file, "byte skip -1 is only allowed with raw encoding");
        }
        Path dataFile = file;
        long offset = dataStart;
        if (detached) {
            String name = fields.get("data file");
            if (name.startsWith("LIST") || TextHeaders.words(name).length > 1) {
                throw new InputException(file, "data file \"" + clip(name) + "\": lists and file patterns are not supported");
            }
            dataFile = TextHeaders.dataFile(file, name, limits);
            offset = 0;
        }
        offset = skipLines(file, dataFile, offset, lineSkip);
        Payload.Layout layout;
        if (compression == Payload.Compression.RAW) {
            layout = new Payload.Layout(dataFile, byteSkip == -1 ? 0 : offset + byteSkip, compression, 0, byteSkip == -1, type, order);
        } else {
            layout = new Payload.Layout(dataFile, offset, compression, byteSkip, false, type, order);
        }
        return new Header(geometry, layout);
    }

    private static String clip(String s) {
        return s.length() > 60 ? s.substring(0, 60) + "..." : s;
    }

    private static String require(Path file, Map<String, String> fields, String key) throws InputException {
        String v = fields.get(key);
        if (v == null) {
            throw new InputException(file, "missing required field \"" + key + "\"");
        }
        return v;
    }

    private static long skipLines(Path file, Path dataFile, long offset, long lines) throws InputException {
        if (lines == 0) {
            return offset;
        }
        try (InputStream in = Files.newInputStream(dataFile)) {
            in.skipNBytes(offset);
            byte[] buf = new byte[1 << 16];
            long pos = offset;
            long left = lines;
            int r;
            while ((r = in.read(buf)) > 0) {
                for (int i = 0; i < r; i++) {
                    if (buf[i] == '\n' && --left == 0) {
                        return pos + i + 1;
                    }
                }
                pos += r;
            }
            throw new InputException(file, "line skip " + lines + " goes past the end of " + dataFile.getFileName());
        } catch (NoSuchFileException e) {
            throw new InputException(file, "data file not found: " + dataFile);
        } catch (java.io.EOFException e) {
            throw new InputException(file, "truncated data: the data starts beyond the end of " + dataFile.getFileName());
        } catch (IOException e) {
            throw new InputException(file, "cannot read " + dataFile + ": " + e.getMessage(), e);
        }
    }

    /** Sign (+1/-1) per world axis turning the header's space into RAS, and the space dimension. */
    private record Space(double[] toRas, int dimension, boolean named) {
    }

    private static Space space(Path file, Map<String, String> fields) throws InputException {
        String s = fields.get("space");
        if (s != null) {
            String n = s.trim().toLowerCase(Locale.ROOT);
            return switch (n) {
                case "right-anterior-superior", "ras" -> new Space(new double[] {1, 1, 1}, 3, true);
                case "left-anterior-superior", "las" -> new Space(new double[] {-1, 1, 1}, 3, true);
                case "left-posterior-superior", "lps" -> new Space(new double[] {-1, -1, 1}, 3, true);
                case "right-anterior-superior-time", "rast" -> new Space(new double[] {1, 1, 1}, 4, true);
                case "left-anterior-superior-time", "last" -> new Space(new double[] {-1, 1, 1}, 4, true);
                case "left-posterior-superior-time", "lpst" -> new Space(new double[] {-1, -1, 1}, 4, true);
                case "scanner-xyz", "3d-right-handed" -> new Space(new double[] {1, 1, 1}, 3, true);
                case "scanner-xyz-time", "3d-right-handed-time" -> new Space(new double[] {1, 1, 1}, 4, true);
                default -> throw new InputException(file, "unsupported space \"" + s + "\"");
            };
        }
        String sd = fields.get("space dimension");
        if (sd != null) {
            long d = TextHeaders.parseLong(file, "space dimension", sd);
            if (d < 1 || d > 3) {
                throw new InputException(file, "space dimension " + d + " (1..3 supported without a named space)");
            }
            return new Space(new double[] {1, 1, 1}, (int) d, false);
        }
        return null;
    }

    private static double[] vector(Path file, String field, String text, int n) throws InputException {
        String t = text.trim();
        if (!t.startsWith("(") || !t.endsWith(")")) {
            throw new InputException(file, field + ": expected a vector like (x,y,z), found \"" + clip(t) + "\"");
        }
        String[] parts = t.substring(1, t.length() - 1).split(",");
        if (parts.length != n) {
            throw new InputException(file, field + ": vector " + clip(t) + " has " + parts.length + " components, space dimension is " + n);
        }
        double[] v = new double[n];
        for (int i = 0; i < n; i++) {
            v[i] = TextHeaders.parseDouble(file, field, parts[i]);
            if (!Double.isFinite(v[i])) {
                throw new InputException(file, field + ": non-finite component in " + clip(t));
            }
        }
        return v;
    }

    /** Splits "(1,0,0) none (0,0,2)" into its entries (vectors may contain spaces). */
    private static List<String> entries(String text) {
        List<String> out = new ArrayList<>();
        String t = text.trim();
        int i = 0;
        while (i < t.length()) {
            char c = t.charAt(i);
            if (Character.isWhitespace(c)) {
                i++;
            } else if (c == '(') {
                int close = t.indexOf(')', i);
                int end = close < 0 ? t.length() : close + 1;
                out.add(t.substring(i, end));
                i = end;
            } else {
                int end = i;
                while (end < t.length() && !Character.isWhitespace(t.charAt(end))) {
                    end++;
                }
                out.add(t.substring(i, end));
                i = end;
            }
        }
        return out;
    }

    private static Geometry geometry(Path file, Map<String, String> fields, int dimension, long[] sizes) throws InputException {
        Space space = space(file, fields);
        String dirText = fields.get("space directions");
        List<Integer> spatial = new ArrayList<>();
        List<double[]> columns = new ArrayList<>();
        if (dirText != null) {
            if (space == null) {
                throw new InputException(file, "space directions given without space or space dimension");
            }
            List<String> entries = entries(dirText);
            if (entries.size() != dimension) {
                throw new InputException(file, "space directions lists " + entries.size() + " entries for dimension " + dimension);
            }
            for (int a = 0; a < dimension; a++) {
                String e = entries.get(a);
                if (e.equalsIgnoreCase("none")) {
                    continue;
                }
                double[] v = vector(file, "space directions", e, space.dimension());
                double[] v3 = {v[0], space.dimension() > 1 ? v[1] : 0, space.dimension() > 2 ? v[2] : 0};
                if (v3[0] == 0 && v3[1] == 0 && v3[2] == 0) {
                    continue; // a time axis of a space-time frame
                }
                spatial.add(a);
                columns.add(v3);
            }
            for (int a = 0; a < dimension; a++) {
                if (!spatial.contains(a) && sizes[a] != 1) {
                    throw new InputException(file, "axis " + a + " is not spatial and has " + sizes[a]
                        + " samples; only scalar volumes (one sample per voxel) can be read");
                }
            }
        } else {
            double[] sp = new double[dimension];
            String spText = fields.get("spacings");
            String[] words = spText == null ? new String[0] : TextHeaders.words(spText);
            if (spText != null && words.length != dimension) {
                throw new InputException(file, "spacings lists " + words.length + " values for dimension " + dimension);
            }
            for (int a = 0; a < dimension; a++) {
                double s = words.length == 0 ? Double.NaN : TextHeaders.parseDouble(file, "spacings", words[a]);
                sp[a] = Double.isFinite(s) && s != 0 ? Math.abs(s) : 1.0;
            }
            List<Integer> axes = new ArrayList<>();
            for (int a = 0; a < dimension; a++) {
                axes.add(a);
            }
            for (int a = dimension - 1; a >= 0 && axes.size() > 3; a--) {
                if (sizes[a] == 1) {
                    axes.remove(Integer.valueOf(a));
                }
            }
            if (axes.size() > 3) {
                throw new InputException(file, dimension + "-D array with more than 3 axes of more than one sample");
            }
            for (int k = 0; k < axes.size(); k++) {
                int a = axes.get(k);
                spatial.add(a);
                double[] v = new double[3];
                v[k] = sp[a];
                columns.add(v);
            }
        }
        if (spatial.size() > 3) {
            throw new InputException(file, spatial.size() + " spatial axes (at most 3 supported)");
        }
        if (spatial.isEmpty()) {
            throw new InputException(file, "no spatial axis");
        }
        double[] origin = {0, 0, 0};
        String originText = fields.get("space origin");
        if (originText != null) {
            if (space == null) {
                throw new InputException(file, "space origin given without space or space dimension");
            }
            double[] o = vector(file, "space origin", originText, space.dimension());
            for (int i = 0; i < Math.min(3, o.length); i++) {
                origin[i] = o[i];
            }
        }
        double[] unitMm = {1, 1, 1};
        String unitsText = fields.get("space units");
        if (unitsText != null && space != null) {
            List<String> us = new ArrayList<>();
            java.util.regex.Matcher m = java.util.regex.Pattern.compile("\"([^\"]*)\"").matcher(unitsText);
            while (m.find()) {
                us.add(m.group(1));
            }
            for (int i = 0; i < Math.min(3, us.size()); i++) {
                if (us.get(i).isEmpty() || us.get(i).equalsIgnoreCase("none") || us.get(i).equals("???")) {
                    continue;
                }
                double f = TextHeaders.unitToMm(us.get(i));
                if (Double.isNaN(f)) {
                    if (space.dimension() == 4 && i == 3) {
                        continue;
                    }
                    throw new InputException(file, "unsupported space unit \"" + us.get(i) + "\"");
                }
                unitMm[i] = f;
            }
        }
        // Fill missing axes (2-D data) with a unit vector orthogonal to the others.
        while (columns.size() < 3) {
            columns.add(complement(columns));
        }
        int[] dims = {1, 1, 1};
        for (int k = 0; k < spatial.size(); k++) {
            dims[k] = (int) sizes[spatial.get(k)];
        }
        double[] sign = space == null ? new double[] {1, 1, 1} : space.toRas();
        double[][] affine = new double[4][4];
        double[] spacing = new double[3];
        for (int c = 0; c < 3; c++) {
            double[] v = columns.get(c);
            double norm = 0;
            for (int r = 0; r < 3; r++) {
                double x = v[r] * unitMm[r];
                affine[r][c] = sign[r] * x;
                norm += x * x;
            }
            spacing[c] = Math.sqrt(norm);
            if (!(spacing[c] > 0) || Double.isInfinite(spacing[c])) {
                throw new InputException(file, "space direction of axis " + c + " has zero or non-finite length");
            }
        }
        for (int r = 0; r < 3; r++) {
            affine[r][3] = sign[r] * origin[r] * unitMm[r];
        }
        affine[3][3] = 1;
        return new Geometry(dims, spacing, affine);
    }

    private static double[] complement(List<double[]> cols) {
        if (cols.size() == 2) {
            double[] a = cols.get(0);
            double[] b = cols.get(1);
            double[] c = {a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]};
            double n = Math.sqrt(c[0] * c[0] + c[1] * c[1] + c[2] * c[2]);
            if (n > 0) {
                return new double[] {c[0] / n, c[1] / n, c[2] / n};
            }
        }
        for (int k = 0; k < 3; k++) {
            double[] e = new double[3];
            e[k] = 1;
            boolean used = false;
            for (double[] col : cols) {
                double dot = col[0] * e[0] + col[1] * e[1] + col[2] * e[2];
                double n = Math.sqrt(col[0] * col[0] + col[1] * col[1] + col[2] * col[2]);
                if (Math.abs(dot) > 1e-9 * n) {
                    used = true;
                }
            }
            if (!used) {
                return e;
            }
        }
        return new double[] {0, 0, 1};
    }
}
