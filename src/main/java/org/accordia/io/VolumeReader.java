package org.accordia.io;

import java.nio.file.Path;

/**
 * Reads one file format. Implementations never allocate from an unchecked header field, read
 * at most the declared payload (and never beyond the file's length), and let no exception other
 * than {@link InputException} escape for bad input.
 */
public interface VolumeReader {
    /** Short name of the format, e.g. "NIfTI-1". */
    String formatName();

    /** True when this reader handles the file, judged by its name (extension). */
    boolean accepts(Path file);

    /** Reads a label mask; non-integral or negative values are an {@link InputException}. */
    LabelVolume readLabels(Path file, ReadLimits limits) throws InputException;

    /** Reads an intensity image as floats (scaling applied). */
    ImageVolume readImage(Path file, ReadLimits limits) throws InputException;

    /**
     * Reads only the geometry. Formats with a separate header override this to read the header
     * alone (no payload is decompressed); the default reads the whole image.
     */
    default Geometry readGeometry(Path file, ReadLimits limits) throws InputException {
        return readImage(file, limits).geometry();
    }

    /**
     * How many leading bytes of {@code file} this reader reads: what an input checksum must cover
     * and need not exceed. The default is the whole file.
     */
    default long bytesRead(Path file, ReadLimits limits) throws InputException {
        return Payload.fileSize(file, file);
    }
}
