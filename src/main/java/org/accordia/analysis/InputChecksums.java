package org.accordia.analysis;

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

/** SHA-256 of every input file, so a report names exactly the bytes it was made from. */
public final class InputChecksums {
    private InputChecksums() {
    }

    /**
     * One input file.
     *
     * @param path the path relative to the study root ('/'-separated), or absolute when outside it
     * @param bytes the file's size in bytes
     * @param sha256 lower-case hex SHA-256 of the file's bytes
     */
    public record InputFile(String path, long bytes, String sha256) {
    }

    /** Checksums of {@code files}, in the given order; paths shown relative to {@code root}. */
    public static List<InputFile> of(List<Path> files, Path root) throws InputException {
        List<InputFile> out = new ArrayList<>();
        byte[] buf = new byte[1 << 16];
        for (Path f : files) {
            MessageDigest md;
            try {
                md = MessageDigest.getInstance("SHA-256");
            } catch (NoSuchAlgorithmException e) {
                throw new IllegalStateException("SHA-256 is required of every Java platform", e);
            }
            long n = 0;
            try (InputStream in = Files.newInputStream(f)) {
                int k;
                while ((k = in.read(buf)) > 0) {
                    md.update(buf, 0, k);
                    n += k;
                }
            } catch (IOException e) {
                throw new InputException(f, "cannot read for its checksum: " + e.getMessage());
            }
            Path abs = f.toAbsolutePath().normalize();
            Path r = root == null ? null : root.toAbsolutePath().normalize();
            String shown = r != null && abs.startsWith(r) ? r.relativize(abs).toString().replace('\\', '/') : abs.toString();
            out.add(new InputFile(shown, n, HexFormat.of().formatHex(md.digest())));
        }
        return out;
    }
}
