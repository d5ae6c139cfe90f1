package org.accordia.io;

import java.nio.file.Path;
import java.util.List;
import java.util.Locale;

/**
 * Entry point for reading volumes whatever their format: picks the reader by file name.
 * Add a reader by implementing {@link VolumeReader} and listing it in {@link #READERS}.
 */
public final class Volumes {
    /** Every supported format, tried in order; the first whose {@code accepts} is true reads. */
    private static final List<VolumeReader> READERS = List.of(
        new NiftiReader(),
        new NrrdReader(),
        new MetaImageReader(),
        new ImageJReader()
    );

    private Volumes() {
    }

    public static List<VolumeReader> readers() {
        return READERS;
    }

    /** True when some reader accepts the file name. */
    public static boolean isVolumeFile(Path file) {
        return readerFor(file) != null;
    }

    /** The reader for a file name, or {@code null}. */
    public static VolumeReader readerFor(Path file) {
        for (VolumeReader r : READERS) {
            if (r.accepts(file)) {
                return r;
            }
        }
        return null;
    }

    public static LabelVolume readLabels(Path file, ReadLimits limits) throws InputException {
        return require(file).readLabels(file, limits);
    }

    public static ImageVolume readImage(Path file, ReadLimits limits) throws InputException {
        return require(file).readImage(file, limits);
    }

    /**
     * The geometry alone, read from the header without decompressing the payload for NIfTI,
     * NRRD and MetaImage (ImageJ formats read the whole image).
     */
    public static Geometry readGeometry(Path file, ReadLimits limits) throws InputException {
        return require(file).readGeometry(file, limits);
    }

    /** How many leading bytes of {@code file} its reader reads (see {@link VolumeReader#bytesRead}). */
    public static long bytesRead(Path file, ReadLimits limits) throws InputException {
        return require(file).bytesRead(file, limits);
    }

    /** The file name without its volume extension (e.g. "case01" for "case01.nii.gz"). */
    public static String stem(Path file) {
        String name = file.getFileName().toString();
        String lower = name.toLowerCase(Locale.ROOT);
        for (String ext : new String[] {".nii.gz", ".nii", ".nrrd", ".nhdr", ".mha", ".mhd", ".tiff", ".tif", ".png"}) {
            if (lower.endsWith(ext) && name.length() > ext.length()) {
                return name.substring(0, name.length() - ext.length());
            }
        }
        int dot = name.lastIndexOf('.');
        return dot > 0 ? name.substring(0, dot) : name;
    }

    private static VolumeReader require(Path file) throws InputException {
        InputFiles.requireRegular(file); // before anything opens it: a FIFO or device would block or never end
        VolumeReader r = readerFor(file);
        if (r == null) {
            throw new InputException(file, "unrecognised volume format (expected .nii, .nii.gz, .nrrd, .nhdr, .mha, .mhd, .tif, .tiff or .png)");
        }
        return r;
    }
}
