package org.accordia.io;

import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * Reads MetaImage volumes: {@code .mha} (header and data in one file, {@code ElementDataFile =
 * LOCAL}) and {@code .mhd} with a separate raw or compressed ({@code .zraw}) data file.
 *
 * <p>Follows the MetaImage format description (MetaIO documentation, Kitware/ITK). Keys (matched
 * case-insensitively): ObjectType, NDims, DimSize, ElementType (MET_CHAR, MET_UCHAR, MET_SHORT,
 * MET_USHORT, MET_INT, MET_UINT, MET_LONG, MET_ULONG, MET_LONG_LONG, MET_ULONG_LONG, MET_FLOAT,
 * MET_DOUBLE), ElementNumberOfChannels (must be 1), ElementSpacing (ElementSize as fallback),
 * Offset/Origin/Position, TransformMatrix/Rotation/Orientation, BinaryData (must be true),
 * BinaryDataByteOrderMSB/ElementByteOrderMSB, CompressedData (zlib, or gzip when the stream
 * starts with the gzip magic), CompressedDataSize, HeaderSize (bytes skipped at the start of a
 * separate data file; -1 = the data are the last bytes of the file), ElementDataFile (LOCAL or
 * one file name relative to the header's folder, last key of the header).
 *
 * <p>Direction convention: the nine numbers of TransformMatrix list the direction of index axis
 * 0 first, then axis 1, then axis 2 -- ITK's direction matrix (whose columns are the axis
 * directions) written column by column. This is what ITK's MetaImage writer produces and its
 * reader expects (checked against ITK 5.2 fixtures in the tests). World space is LPS, converted to
 * RAS+ by negating the first two rows of the affine.
 */
public final class MetaImageReader implements VolumeReader {
    @Override
    public String formatName() {
        return "MetaImage";
    }

    @Override
    public boolean accepts(Path file) {
        String name = file.getFileName().toString().toLowerCase(Locale.ROOT);
        return name.endsWith(".mha") || name.endsWith(".mhd");
    }

    @Override
    public LabelVolume readLabels(Path file, ReadLimits limits) throws InputException {
        NrrdReader.Header h = readHeader(file, limits);
        return Payload.readLabels(file, h.layout(), h.geometry(), false, 1, 0);
    }

    @Override
    public ImageVolume readImage(Path file, ReadLimits limits) throws InputException {
        NrrdReader.Header h = readHeader(file, limits);
        return Payload.readImage(file, h.layout(), h.geometry(), false, 1, 0);
    }

    @Override
    public Geometry readGeometry(Path file, ReadLimits limits) throws InputException {
        return readHeader(file, limits).geometry();
    }

    @Override
    public long bytesRead(Path file, ReadLimits limits) throws InputException {
        NrrdReader.Header h = readHeader(file, limits);
        return Payload.bytesRead(file, h.layout(), h.geometry().voxelCount());
    }

    static SampleType sampleType(String elementType) {
        return switch (elementType.trim().toUpperCase(Locale.ROOT)) {
            case "MET_CHAR" -> SampleType.INT8;
            case "MET_UCHAR" -> SampleType.UINT8;
            case "MET_SHORT" -> SampleType.INT16;
            case "MET_USHORT" -> SampleType.UINT16;
            case "MET_INT", "MET_LONG" -> SampleType.INT32;
            case "MET_UINT", "MET_ULONG" -> SampleType.UINT32;
            case "MET_LONG_LONG" -> SampleType.INT64;
            case "MET_ULONG_LONG" -> SampleType.UINT64;
            case "MET_FLOAT" -> SampleType.FLOAT32;
            case "MET_DOUBLE" -> SampleType.FLOAT64;
            default -> null;
        };
    }

    static NrrdReader.Header readHeader(Path file, ReadLimits limits) throws InputException {
        byte[] head = TextHeaders.head(file);
        List<TextHeaders.Line> lines = TextHeaders.lines(head, head.length);
        Map<String, String> keys = new HashMap<>();
        long dataStart = -1;
        String dataName = null;
        for (int i = 0; i < lines.size(); i++) {
            String text = lines.get(i).text();
            if (text.isBlank()) {
                continue;
            }
            int eq = text.indexOf('=');
            if (eq <= 0) {
                throw new InputException(file, i == 0
                    ? "bad magic: a MetaImage header starts with \"Key = Value\" lines"
                    : "malformed header line " + (i + 1) + ": \"" + clip(text) + "\"");
            }
            String key = text.substring(0, eq).trim().toLowerCase(Locale.ROOT);
            String value = text.substring(eq + 1).trim();
            if (i == 0 && !key.equals("objecttype") && !key.equals("ndims")) {
                throw new InputException(file, "bad magic: a MetaImage header starts with ObjectType or NDims, found \""
                    + clip(text) + "\"");
            }
            if (key.equals("elementdatafile")) {
                dataName = value;
                dataStart = lines.get(i).end();
                break;
            }
            keys.put(key, value);
        }
        if (dataName == null) {
            throw new InputException(file, head.length == TextHeaders.MAX_HEADER_BYTES
                ? "header longer than " + TextHeaders.MAX_HEADER_BYTES + " bytes"
                : "truncated header: no ElementDataFile key");
        }
        String objectType = keys.get("objecttype");
        if (objectType != null && !objectType.equalsIgnoreCase("Image")) {
            throw new InputException(file, "ObjectType is \"" + objectType + "\", only Image is read");
        }
        String binary = keys.get("binarydata");
        if (binary != null && !bool(file, "BinaryData", binary)) {
            throw new InputException(file, "BinaryData = False (ASCII data) is not supported");
        }
        long ndims = TextHeaders.parseLong(file, "NDims", require(file, keys, "ndims", "NDims"));
        if (ndims < 2 || ndims > 7) {
            throw new InputException(file, "NDims = " + ndims + " (must be 2..7)");
        }
        int n = (int) ndims;
        long[] sizes = longs(file, "DimSize", require(file, keys, "dimsize", "DimSize"), n);
        Payload.voxelCount(file, sizes, limits);
        for (int d = 3; d < n; d++) {
            if (sizes[d] != 1) {
                throw new InputException(file, "DimSize[" + d + "] = " + sizes[d] + ": a " + n + "-D series with "
                    + sizes[d] + (d == 3 ? " time points" : " entries") + " is not a single 3-D volume");
            }
        }
        String channels = keys.get("elementnumberofchannels");
        if (channels != null && TextHeaders.parseLong(file, "ElementNumberOfChannels", channels) != 1) {
            throw new InputException(file, "ElementNumberOfChannels = " + channels + " (only one channel is read)");
        }
        String typeText = require(file, keys, "elementtype", "ElementType");
        SampleType type = sampleType(typeText);
        if (type == null) {
            throw new InputException(file, "unsupported ElementType \"" + typeText + "\"");
        }
        String msb = keys.containsKey("binarydatabyteordermsb") ? keys.get("binarydatabyteordermsb") : keys.get("elementbyteordermsb");
        ByteOrder order = msb != null && bool(file, "BinaryDataByteOrderMSB", msb) ? ByteOrder.BIG_ENDIAN : ByteOrder.LITTLE_ENDIAN;

        int s = Math.min(n, 3);
        double[] spacing = {1, 1, 1};
        String spacingText = keys.containsKey("elementspacing") ? keys.get("elementspacing") : keys.get("elementsize");
        if (spacingText != null) {
            double[] v = doubles(file, "ElementSpacing", spacingText, n);
            for (int d = 0; d < s; d++) {
                spacing[d] = Math.abs(v[d]);
                if (!(spacing[d] > 0) || Double.isInfinite(spacing[d])) {
                    throw new InputException(file, "ElementSpacing[" + d + "] = " + v[d] + " is not a valid voxel size");
                }
            }
        }
        double[] origin = {0, 0, 0};
        String originText = first(keys, "offset", "origin", "position");
        if (originText != null) {
            double[] v = doubles(file, "Offset", originText, n);
            System.arraycopy(v, 0, origin, 0, s);
        }
        // dir[axis] = direction of index axis `axis` in LPS (identity by default).
        double[][] dir = {{1, 0, 0}, {0, 1, 0}, {0, 0, 1}};
        String matrixText = first(keys, "transformmatrix", "rotation", "orientation");
        if (matrixText != null) {
            double[] v = doubles(file, "TransformMatrix", matrixText, n * n);
            for (int axis = 0; axis < s; axis++) {
                for (int c = 0; c < s; c++) {
                    dir[axis][c] = v[axis * n + c];
                }
            }
        }
        int[] dims = {(int) sizes[0], (int) sizes[1], n >= 3 ? (int) sizes[2] : 1};
        double[][] affine = new double[4][4];
        double[] toRas = {-1, -1, 1};
        for (int r = 0; r < 3; r++) {
            for (int axis = 0; axis < 3; axis++) {
                affine[r][axis] = toRas[r] * dir[axis][r] * spacing[axis];
            }
            affine[r][3] = toRas[r] * origin[r];
        }
        affine[3][3] = 1;
        Geometry geometry = new Geometry(dims, spacing, affine);

        boolean compressed = keys.containsKey("compresseddata") && bool(file, "CompressedData", keys.get("compresseddata"));
        Path dataFile;
        long offset;
        boolean atEnd = false;
        if (dataName.equalsIgnoreCase("LOCAL")) {
            dataFile = file;
            offset = dataStart < 0 ? Files.exists(file) ? Payload.fileSize(file, file) : 0 : dataStart;
        } else {
            if (dataName.toUpperCase(Locale.ROOT).startsWith("LIST") || TextHeaders.words(dataName).length > 1
                    || dataName.contains("%")) {
                throw new InputException(file, "ElementDataFile \"" + clip(dataName) + "\": lists and file patterns are not supported");
            }
            dataFile = TextHeaders.dataFile(file, dataName, limits);
            long headerSize = keys.containsKey("headersize") ? TextHeaders.parseLong(file, "HeaderSize", keys.get("headersize")) : 0;
            if (headerSize < -1) {
                throw new InputException(file, "HeaderSize " + headerSize + " is below -1");
            }
            atEnd = headerSize == -1;
            offset = Math.max(0, headerSize);
        }
        Payload.Compression compression = Payload.Compression.RAW;
        if (compressed) {
            if (atEnd) {
                throw new InputException(file, "HeaderSize = -1 cannot be used with compressed data");
            }
            compression = startsWithGzipMagic(file, dataFile, offset) ? Payload.Compression.GZIP : Payload.Compression.ZLIB;
            String cds = keys.get("compresseddatasize");
            if (cds != null) {
                long declared = TextHeaders.parseLong(file, "CompressedDataSize", cds);
                long available = Payload.fileSize(file, dataFile) - offset;
                if (declared > available) {
                    throw new InputException(file, "truncated data: CompressedDataSize is " + declared + " bytes, found "
                        + Math.max(0, available));
                }
            }
        }
        return new NrrdReader.Header(geometry, new Payload.Layout(dataFile, offset, compression, 0, atEnd, type, order));
    }

    private static boolean startsWithGzipMagic(Path file, Path dataFile, long offset) throws InputException {
        try (var ch = java.nio.channels.FileChannel.open(dataFile)) {
            java.nio.ByteBuffer b = java.nio.ByteBuffer.allocate(2);
            ch.read(b, offset);
            return b.position() == 2 && (b.get(0) & 0xFF) == 0x1F && (b.get(1) & 0xFF) == 0x8B;
        } catch (java.io.IOException e) {
            throw new InputException(file, "cannot read " + dataFile + ": " + e.getMessage(), e);
        }
    }

    private static String first(Map<String, String> keys, String... names) {
        for (String k : names) {
            if (keys.containsKey(k)) {
                return keys.get(k);
            }
        }
        return null;
    }

    private static boolean bool(Path file, String key, String value) throws InputException {
        String v = value.trim().toLowerCase(Locale.ROOT);
        return switch (v) {
            case "true", "1", "yes" -> true;
            case "false", "0", "no" -> false;
            default -> throw new InputException(file, key + " must be True or False, found \"" + value + "\"");
        };
    }

    private static String require(Path file, Map<String, String> keys, String key, String name) throws InputException {
        String v = keys.get(key);
        if (v == null) {
            throw new InputException(file, "missing required key " + name);
        }
        return v;
    }

    private static long[] longs(Path file, String key, String text, int n) throws InputException {
        String[] w = TextHeaders.words(text);
        if (w.length != n) {
            throw new InputException(file, key + " lists " + w.length + " values, NDims is " + n);
        }
        long[] out = new long[n];
        for (int i = 0; i < n; i++) {
            out[i] = TextHeaders.parseLong(file, key, w[i]);
        }
        return out;
    }

    private static double[] doubles(Path file, String key, String text, int n) throws InputException {
        String[] w = TextHeaders.words(text);
        if (w.length < n) {
            throw new InputException(file, key + " lists " + w.length + " values, " + n + " expected");
        }
        double[] out = new double[n];
        for (int i = 0; i < n; i++) {
            out[i] = TextHeaders.parseDouble(file, key, w[i]);
            if (!Double.isFinite(out[i])) {
                throw new InputException(file, key + " holds a non-finite value");
            }
        }
        return out;
    }

    private static String clip(String s) {
        return s.length() > 60 ? s.substring(0, 60) + "..." : s;
    }
}
