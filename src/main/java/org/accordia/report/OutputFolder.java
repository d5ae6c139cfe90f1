package org.accordia.report;

import java.io.BufferedOutputStream;
import java.io.FilterOutputStream;
import java.io.IOException;
import java.io.OutputStream;
import java.nio.channels.Channels;
import java.nio.channels.FileChannel;
import java.nio.charset.StandardCharsets;
import java.nio.file.DirectoryStream;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.nio.file.StandardOpenOption;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.ArrayList;
import java.util.HexFormat;
import java.util.List;
import java.util.Locale;
import java.util.Set;
import java.util.UUID;
import java.util.regex.Pattern;
import org.accordia.io.InputException;

/**
 * The output folder of one run, and the only way outputs are written into it.
 *
 * <p>Guarantees:
 * <ul>
 *   <li>{@link #prepare(Path, boolean)} creates a missing folder; it refuses an existing folder that
 *       holds anything but our own stale temporary files, unless {@code force}, with an
 *       {@link InputException} naming the folder. A refusal changes nothing on disk.</li>
 *   <li>With {@code force}, the previous {@value #REPORT_HTML} and {@value #SUMMARY_JSON} are deleted
 *       <em>first</em>, before anything new is written, so a run killed part-way leaves no report
 *       rather than an old report beside new tables. Every other file stays until a new one with
 *       the same name replaces it (files of an earlier run that this run does not produce stay).</li>
 *   <li>Our own temporary files left by a killed earlier run ({@code .NAME.partial-RANDOM}) are
 *       removed. Nothing outside the folder, and nothing inside it but the files named above and
 *       those temporaries, is ever deleted; symbolic links are never followed for deletion.</li>
 *   <li>{@link #writeAtomically(String, IOConsumer)} writes to a temporary name in the same folder,
 *       flushes it to disk (fsync) and renames it atomically onto the final name, so a reader sees
 *       either the old file, or the complete new one, never a partial file. A failed write deletes
 *       its temporary file and leaves the final name untouched.</li>
 *   <li>Relative names are checked: absolute names, {@code ..}, empty segments and any segment
 *       outside {@code [A-Za-z0-9._-]} or starting with a dot are refused; use
 *       {@link #safeFileName(String)} for names that come from input (case and reader names).</li>
 * </ul>
 */
public final class OutputFolder {
    /** The HTML report's file name; deleted first by a forced run. */
    public static final String REPORT_HTML = "report.html";
    /** The JSON summary's file name; deleted first by a forced run. */
    public static final String SUMMARY_JSON = "summary.json";
    /** Longest part of a sanitised name kept before the hash suffix. */
    public static final int MAX_SAFE_STEM = 100;

    private static final String PARTIAL = ".partial-";
    private static final Pattern TEMPORARY = Pattern.compile("^\\..+\\.partial-[0-9a-f]{32}$");
    private static final Pattern SAFE_SEGMENT = Pattern.compile("^[A-Za-z0-9_-][A-Za-z0-9._-]{0,254}$");
    private static final Set<String> RESERVED = Set.of("CON", "PRN", "AUX", "NUL",
        "COM1", "COM2", "COM3", "COM4", "COM5", "COM6", "COM7", "COM8", "COM9",
        "LPT1", "LPT2", "LPT3", "LPT4", "LPT5", "LPT6", "LPT7", "LPT8", "LPT9");

    private final Path dir;
    /** Whether {@link #prepare} created the folder (then {@link #discardThisRun} may remove it). */
    private final boolean created;
    /** Final paths written by this instance, and sub-folders it created, for {@link #discardThisRun}. */
    private final Set<Path> written = java.util.concurrent.ConcurrentHashMap.newKeySet();
    private final Set<Path> createdFolders = java.util.concurrent.ConcurrentHashMap.newKeySet();

    private OutputFolder(Path dir, boolean created) {
        this.dir = dir;
        this.created = created;
    }

    /**
     * Makes {@code dir} ready for a run (see the class description).
     *
     * @throws InputException the path is not a folder, the folder is not empty and {@code force} is
     *     false, or a file to replace cannot be removed
     * @throws IOException the folder cannot be created or listed
     */
    public static OutputFolder prepare(Path dir, boolean force) throws InputException, IOException {
        try {
            return prepareFolder(dir, force);
        } catch (WriteFailure | InputException e) {
            throw e;
        } catch (IOException e) {
            throw new WriteFailure(dir, "cannot prepare the output folder", e);
        }
    }

    /**
     * Refuses an output folder that is, or lies inside, the study folder or a folder holding one of
     * its input files, comparing real paths (symbolic links resolved): {@code --out} given as a link
     * to the study, or as a folder inside it, or a not yet existing folder whose nearest existing
     * ancestor resolves into the study, is refused before anything is written.
     *
     * @param out the output folder as given
     * @param studyRoot the study folder (the manifest's folder for a manifest)
     * @param inputs every input file
     */
    public static void requireOutsideStudy(Path out, Path studyRoot, List<Path> inputs) throws InputException {
        Path outReal = realOrProjected(out);
        Path rootReal = realOrProjected(studyRoot);
        if (outReal.startsWith(rootReal)) {
            throw new InputException(out, "the output folder " + (outReal.equals(rootReal) ? "is" : "lies inside")
                + " the study folder (" + outReal + "); choose an output folder outside the study");
        }
        for (Path p : inputs) {
            if (realOrProjected(p).startsWith(outReal)) {
                throw new InputException(out, "the output folder holds input files (" + p.getFileName()
                    + "); choose an output folder outside the study");
            }
        }
    }

    /**
     * The real path of {@code p}; for a path that does not exist (yet), the real path of its nearest
     * existing ancestor followed by the remaining names.
     */
    static Path realOrProjected(Path p) {
        Path abs = p.toAbsolutePath().normalize();
        Path existing = abs;
        while (existing != null && !Files.exists(existing)) {
            existing = existing.getParent();
        }
        if (existing == null) {
            return abs;
        }
        try {
            return existing.toRealPath().resolve(existing.relativize(abs)).normalize();
        } catch (IOException e) {
            return abs;
        }
    }

    private static OutputFolder prepareFolder(Path dir, boolean force) throws InputException, IOException {
        Path abs = dir.toAbsolutePath().normalize();
        if (Files.exists(abs) && !Files.isDirectory(abs)) {
            throw new InputException(dir, "the output path exists and is not a folder");
        }
        boolean created = !Files.exists(abs);
        Files.createDirectories(abs);
        if (!Files.isWritable(abs)) {
            throw new WriteFailure(dir, "the output folder is not writable (permission denied)", null);
        }
        List<Path> temporaries = new ArrayList<>();
        List<Path> others = new ArrayList<>();
        try (DirectoryStream<Path> entries = Files.newDirectoryStream(abs)) {
            for (Path p : entries) {
                if (isOurTemporary(p)) {
                    temporaries.add(p);
                } else {
                    others.add(p);
                }
            }
        }
        if (!others.isEmpty() && !force) {
            throw new InputException(dir, "the output folder is not empty (" + others.size()
                + " entries); choose a new folder, or use --force to replace the report in it");
        }
        if (force) {
            for (String name : List.of(REPORT_HTML, SUMMARY_JSON)) {
                Path p = abs.resolve(name);
                if (Files.isDirectory(p, LinkOption.NOFOLLOW_LINKS)) {
                    throw new InputException(p, "expected a file from an earlier run, found a folder; remove it or choose another output folder");
                }
                Files.deleteIfExists(p); // a symbolic link is removed itself, its target is untouched
            }
        }
        for (Path p : temporaries) {
            Files.deleteIfExists(p);
        }
        if (force) {
            // stale temporaries of sub-folders this class created (e.g. per-case pictures)
            try (var walk = Files.walk(abs, 3)) {
                for (Path p : (Iterable<Path>) walk::iterator) {
                    if (!p.getParent().equals(abs) && isOurTemporary(p)) {
                        Files.deleteIfExists(p);
                    }
                }
            }
        }
        syncDirectory(abs);
        return new OutputFolder(abs, created);
    }

    /**
     * Undoes this run after a failure: deletes every file this instance wrote, then the
     * sub-folders it created once they are empty, then the folder itself when {@link #prepare}
     * created it and it is empty. Files of earlier runs that this run did not replace stay.
     * Best effort: a file that cannot be deleted is left (and named in the returned list).
     *
     * @return the paths that could not be removed (normally none)
     */
    public List<Path> discardThisRun() {
        List<Path> left = new ArrayList<>();
        for (Path p : written) {
            try {
                Files.deleteIfExists(p);
            } catch (IOException e) {
                left.add(p);
            }
        }
        written.clear();
        List<Path> folders = new ArrayList<>(createdFolders);
        folders.sort((a, b) -> b.getNameCount() - a.getNameCount()); // deepest first
        if (created) {
            folders.add(dir);
        }
        for (Path f : folders) {
            try (DirectoryStream<Path> entries = Files.newDirectoryStream(f)) {
                if (entries.iterator().hasNext()) {
                    continue;
                }
            } catch (IOException e) {
                continue;
            }
            try {
                Files.deleteIfExists(f);
            } catch (IOException e) {
                left.add(f);
            }
        }
        createdFolders.clear();
        return left;
    }

    /** The folder (absolute, normalised). */
    public Path dir() {
        return dir;
    }

    /**
     * Writes one output file atomically: {@code body} writes to a temporary file in the target's
     * folder, which is flushed to disk and renamed onto {@code relativeName} only when {@code body}
     * returned normally. {@code body} must not close the stream (closing it is harmless).
     *
     * @param relativeName a name inside the folder, optionally with {@code /}-separated sub-folders,
     *     each segment matching {@code [A-Za-z0-9_-][A-Za-z0-9._-]*}
     * @return the final path
     * @throws IllegalArgumentException the name is absolute, escapes the folder or has an unsafe segment
     * @throws IOException writing failed; the final name is untouched and no temporary file remains
     */
    public Path writeAtomically(String relativeName, IOConsumer<OutputStream> body) throws IOException {
        try {
            return writeFile(relativeName, body);
        } catch (WriteFailure e) {
            throw e;
        } catch (IOException e) {
            throw new WriteFailure(dir, "cannot write " + relativeName, e);
        }
    }

    /**
     * An output could not be written: a full disk, a folder without write permission, a path too
     * long for the file system. The command line reports it as one line naming the output folder
     * and the problem, exit code 2 (it is the environment's fault, not a bug).
     */
    public static final class WriteFailure extends IOException {
        private static final long serialVersionUID = 1L;

        WriteFailure(Path folder, String what, IOException cause) {
            super(folder + ": " + what + (cause == null ? "" : ": " + reason(cause)), cause);
        }

        private static String reason(IOException e) {
            if (e instanceof java.nio.file.FileSystemException fs && fs.getReason() != null) {
                return fs.getReason() + (fs.getFile() == null ? "" : " (" + fs.getFile() + ")");
            }
            return e.getMessage() == null ? e.getClass().getSimpleName() : e.getMessage();
        }
    }

    private Path writeFile(String relativeName, IOConsumer<OutputStream> body) throws IOException {
        Path target = resolveChecked(relativeName);
        Path parent = target.getParent();
        for (Path p = parent; !p.equals(dir) && p.startsWith(dir); p = p.getParent()) {
            if (!Files.isDirectory(p)) {
                createdFolders.add(p);
            }
        }
        Files.createDirectories(parent);
        if (!parent.toRealPath().startsWith(dir.toRealPath())) {
            throw new IllegalArgumentException("output name leaves the output folder: " + relativeName);
        }
        Path temporary = parent.resolve("." + target.getFileName() + PARTIAL
            + UUID.randomUUID().toString().replace("-", ""));
        boolean done = false;
        try {
            try (FileChannel channel = FileChannel.open(temporary, StandardOpenOption.CREATE_NEW, StandardOpenOption.WRITE)) {
                OutputStream raw = Channels.newOutputStream(channel);
                BufferedOutputStream buffered = new BufferedOutputStream(raw, 1 << 16);
                body.accept(new FilterOutputStream(buffered) {
                    @Override
                    public void write(byte[] b, int off, int len) throws IOException {
                        out.write(b, off, len);
                    }

                    @Override
                    public void close() throws IOException {
                        flush(); // the channel is closed by writeAtomically, after fsync
                    }
                });
                buffered.flush();
                channel.force(true);
            }
            Files.move(temporary, target, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
            written.add(target);
            done = true;
        } finally {
            if (!done) {
                try {
                    Files.deleteIfExists(temporary);
                } catch (IOException suppressed) {
                    // the original failure matters more; prepare() removes it on the next run
                }
            }
        }
        syncDirectory(parent);
        return target;
    }

    /** Writes a UTF-8 text atomically (see {@link #writeAtomically(String, IOConsumer)}). */
    public Path writeString(String relativeName, String text) throws IOException {
        byte[] bytes = text.getBytes(StandardCharsets.UTF_8);
        return writeAtomically(relativeName, out -> out.write(bytes));
    }

    /** Writes bytes atomically (see {@link #writeAtomically(String, IOConsumer)}). */
    public Path writeBytes(String relativeName, byte[] bytes) throws IOException {
        return writeAtomically(relativeName, out -> out.write(bytes));
    }

    /**
     * Maps any name (a case, reader or label name from input) to a safe file name, deterministically.
     * Characters in {@code [A-Za-z0-9._-]} are kept, every other character (code point) becomes
     * {@code _}, leading dots become {@code _}, the result is cut to {@value #MAX_SAFE_STEM}
     * characters; when anything was changed (or the name is empty, a reserved device name such as
     * {@code CON}, or already ends like a hash suffix) {@code -} and the first 10 hex digits of the
     * SHA-256 of the name's UTF-8 bytes are appended. Hence a name that is already safe maps to
     * itself, and two different names map to different file names (a collision would need two
     * names whose SHA-256 agree in their first 40 bits). Never returns {@code .} or {@code ..}, and
     * never contains a path separator. Add the extension after calling this method.
     */
    public static String safeFileName(String name) {
        String input = name == null ? "" : name;
        StringBuilder sb = new StringBuilder();
        input.codePoints().forEach(cp -> {
            boolean keep = (cp >= 'A' && cp <= 'Z') || (cp >= 'a' && cp <= 'z') || (cp >= '0' && cp <= '9')
                || cp == '.' || cp == '_' || cp == '-';
            sb.append(keep ? (char) cp : '_');
        });
        for (int i = 0; i < sb.length() && sb.charAt(i) == '.'; i++) {
            sb.setCharAt(i, '_');
        }
        if (sb.length() > MAX_SAFE_STEM) {
            sb.setLength(MAX_SAFE_STEM);
        }
        String stem = sb.toString();
        String base = stem.contains(".") ? stem.substring(0, stem.indexOf('.')) : stem;
        boolean changed = !stem.equals(input) || stem.isEmpty()
            || RESERVED.contains(base.toUpperCase(Locale.ROOT))
            || stem.matches(".*-[0-9a-f]{10}");
        if (!changed) {
            return stem;
        }
        return (stem.isEmpty() ? "_" : stem) + "-" + hash10(input);
    }

    private Path resolveChecked(String relativeName) {
        if (relativeName == null || relativeName.isEmpty()) {
            throw new IllegalArgumentException("empty output name");
        }
        String[] segments = relativeName.split("/", -1);
        for (String s : segments) {
            if (!SAFE_SEGMENT.matcher(s).matches()) {
                throw new IllegalArgumentException("unsafe output name (use OutputFolder.safeFileName): " + relativeName);
            }
        }
        Path target = dir.resolve(relativeName).normalize();
        if (!target.startsWith(dir) || target.equals(dir)) {
            throw new IllegalArgumentException("output name leaves the output folder: " + relativeName);
        }
        return target;
    }

    private static boolean isOurTemporary(Path p) {
        return TEMPORARY.matcher(p.getFileName().toString()).matches()
            && Files.isRegularFile(p, LinkOption.NOFOLLOW_LINKS);
    }

    private static String hash10(String s) {
        try {
            byte[] d = MessageDigest.getInstance("SHA-256").digest(s.getBytes(StandardCharsets.UTF_8));
            return HexFormat.of().formatHex(d, 0, 5);
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException("SHA-256 is required of every Java platform", e);
        }
    }

    private static void syncDirectory(Path folder) {
        // Makes the rename durable on POSIX file systems; not supported everywhere, hence best effort.
        try (FileChannel ch = FileChannel.open(folder, StandardOpenOption.READ)) {
            ch.force(true);
        } catch (IOException | UnsupportedOperationException ignored) {
            // best effort
        }
    }
}
