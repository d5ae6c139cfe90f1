package org.accordia.analysis;

import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.annotation.JsonPropertyOrder;
import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.ArrayList;
import java.util.HexFormat;
import java.util.List;
import org.accordia.io.InputException;
import org.accordia.io.InputFiles;
import org.accordia.io.ReadLimits;
import org.accordia.io.Volumes;

/**
 * SHA-256 of every input file, so a report names exactly the bytes it was made from.
 *
 * <p>The checksum covers the bytes the readers read, never more: a volume file is hashed from
 * its start to the end of its declared payload ({@link Volumes#bytesRead}; bytes after a raw
 * payload are never read, so a valid header followed by a 100 GB tail is hashed as quickly as it is
 * read), every other input (manifest, protocol) whole. {@code sha256_bytes} says how many bytes
 * were hashed; it is less than {@code bytes} only when the file has bytes no reader uses. Each
 * file is checked to be a regular file first: a named pipe or device is never opened.
 */
public final class InputChecksums {
    private InputChecksums() {
    }

    /**
     * One input file.
     *
     * @param path the path relative to the study root ('/'-separated), or absolute when outside it
     * @param bytes the file's size in bytes
     * @param sha256 lower-case hex SHA-256 of the file's first {@code sha256Bytes} bytes
     * @param sha256Bytes how many leading bytes the checksum covers (the bytes the readers read)
     */
    @JsonPropertyOrder({"path", "bytes", "sha256", "sha256_bytes"})
    public record InputFile(String path, long bytes, String sha256, @JsonProperty("sha256_bytes") long sha256Bytes) {
    }

    /** Checksums of {@code files} (whole files), in the given order; paths shown relative to {@code root}. */
    public static List<InputFile> of(List<Path> files, Path root) throws InputException {
        return of(files, root, null);
    }

    /**
     * Checksums of {@code files}, in the given order, each covering the bytes a reader with
     * {@code limits} reads (whole files when {@code limits} is null); paths shown relative to
     * {@code root}.
     */
    public static List<InputFile> of(List<Path> files, Path root, ReadLimits limits) throws InputException {
        List<InputFile> out = new ArrayList<>();
        byte[] buf = new byte[1 << 16];
        for (Path f : files) {
            InputFiles.requireRegular(f);
            MessageDigest md;
            try {
                md = MessageDigest.getInstance("SHA-256");
            } catch (NoSuchAlgorithmException e) {
                throw new IllegalStateException("SHA-256 is required of every Java platform", e);
            }
            long size;
            try {
                size = Files.size(f);
            } catch (IOException e) {
                throw new InputException(f, "cannot read for its checksum: " + e.getMessage());
            }
            long want = limits != null && Volumes.isVolumeFile(f) ? Math.min(size, Volumes.bytesRead(f, limits)) : size;
            long n = 0;
            try (InputStream in = Files.newInputStream(f)) {
                int k;
                while (n < want && (k = in.read(buf, 0, (int) Math.min(buf.length, want - n))) > 0) {
                    md.update(buf, 0, k);
                    n += k;
                }
            } catch (IOException e) {
                throw new InputException(f, "cannot read for its checksum: " + e.getMessage());
            }
            Path abs = f.toAbsolutePath().normalize();
            Path r = root == null ? null : root.toAbsolutePath().normalize();
            String shown = r != null && abs.startsWith(r) ? r.relativize(abs).toString().replace('\\', '/') : abs.toString();
            out.add(new InputFile(shown, size, HexFormat.of().formatHex(md.digest()), n));
        }
        return out;
    }
}
