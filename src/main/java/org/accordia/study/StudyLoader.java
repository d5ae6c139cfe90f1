package org.accordia.study;

import java.io.IOException;
import java.io.Reader;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.CharsetDecoder;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.nio.file.DirectoryStream;
import java.nio.file.Files;
import java.nio.file.InvalidPathException;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeMap;
import java.util.TreeSet;
import org.accordia.io.InputException;
import org.accordia.io.InputFiles;
import org.accordia.io.Volumes;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.apache.commons.csv.DuplicateHeaderMode;

/**
 * Discovers a study from a folder layout or a manifest (see docs/study.md).
 *
 * <ul>
 *   <li>Folder layout: {@code <root>/<centre>/<reader>/<case>.<ext>}, the optional case image in
 *       {@code <root>/images/<case>.<ext>} ({@value #IMAGES} is a reserved top-level name).
 *       Exactly three levels are listed, never deeper, so a symbolic-link loop cannot make the
 *       walk endless; a link that leads back to one of its own ancestors is reported as a loop.
 *       Hidden entries (name starting with '.') are skipped; other files that are not volumes are
 *       reported as notes.</li>
 *   <li>Manifest: a CSV file with a header row and the columns {@code case, centre, reader,
 *       path} and optionally {@code image}; paths are relative to the manifest's folder, which is
 *       the study root. A folder holding {@value #MANIFEST} is read through that manifest.</li>
 * </ul>
 *
 * <p>A mask or image path that leads outside the study root, after normalisation and after
 * resolving symbolic links, is refused unless {@link LoadOptions#allowPathEscape()}.
 */
public final class StudyLoader {
    /** Reserved top-level folder of the layout holding the case images. */
    public static final String IMAGES = "images";
    /**
     * The study's own protocol file at the top of a study folder: read by inspect and analyze
     * when no protocol is given, so discovery does not list it as an ignored file.
     */
    public static final String PROTOCOL = "protocol.yaml";
    /** File name that makes a study folder be read through its manifest. */
    public static final String MANIFEST = "manifest.csv";
    /** The longest file name (in characters) accepted as a centre, reader or case name. */
    public static final int MAX_NAME_LENGTH = 255;

    /** The largest manifest accepted, in bytes. */
    public static final long MAX_MANIFEST_BYTES = 64L << 20;

    private static final List<String> REQUIRED = List.of("case", "centre", "reader", "path");
    private static final String OPTIONAL_IMAGE = "image";

    private StudyLoader() {
    }

    /** Loads a study from a folder (layout or its {@value #MANIFEST}) or from a manifest file. */
    public static Study load(Path studyArg, LoadOptions options) throws InputException {
        if (!Files.exists(studyArg)) {
            throw new InputException(studyArg, "study folder or manifest not found");
        }
        if (Files.isDirectory(studyArg)) {
            Path manifest = studyArg.resolve(MANIFEST);
            if (InputFiles.present(manifest)) {
                // a manifest that is a named pipe, a folder or a broken link is refused, not skipped
                return loadManifest(manifest, options);
            }
            return loadLayout(studyArg, options);
        }
        if (Files.isRegularFile(studyArg)) {
            return loadManifest(studyArg, options);
        }
        throw new InputException(studyArg, "neither a folder nor a manifest file");
    }

    // ---------------------------------------------------------------- folder layout

    /** Loads the folder layout of {@code folder}, ignoring any manifest in it. */
    public static Study loadLayout(Path folder, LoadOptions options) throws InputException {
        Path root = folder.toAbsolutePath().normalize();
        Path rootReal = realPath(root);
        List<StudyProblem> problems = new ArrayList<>();
        Map<String, Path> readerPlace = new HashMap<>();
        Set<String> centres = new TreeSet<>();
        Set<ReaderId> readers = new TreeSet<>();
        Set<String> cases = new TreeSet<>();
        List<MaskRef> masks = new ArrayList<>();
        Map<String, Path> images = new TreeMap<>();

        for (Path top : list(root, problems)) {
            String name = top.getFileName().toString();
            if (skipName(top, name, problems)) {
                continue;
            }
            boolean dir = Files.isDirectory(top);
            if (name.equals(IMAGES) && dir) {
                if (usableFolder(top, root, rootReal, options, problems)) {
                    collectImages(top, root, rootReal, options, images, problems);
                }
                continue;
            }
            if (!dir && name.equals(PROTOCOL)) {
                continue; // the study's protocol, read by inspect and analyze
            }
            if (!dir) {
                problems.add(StudyProblem.note(top, "ignored: files at the top of a study folder are not part of the layout"));
                continue;
            }
            if (!usableFolder(top, root, rootReal, options, problems)) {
                continue;
            }
            String centre = name;
            boolean centreHasReader = false;
            for (Path rdir : list(top, problems)) {
                String rname = rdir.getFileName().toString();
                if (skipName(rdir, rname, problems)) {
                    continue;
                }
                if (!Files.isDirectory(rdir)) {
                    problems.add(StudyProblem.note(rdir, "ignored: a centre folder holds reader folders, not files"));
                    continue;
                }
                if (!usableFolder(rdir, root, rootReal, options, problems)) {
                    continue;
                }
                Path earlier = readerPlace.get(rname);
                if (earlier != null) {
                    throw new InputException(rdir, "reader '" + rname + "' appears under two centres: "
                        + earlier + " and " + rdir + " (a reader belongs to exactly one centre)");
                }
                readerPlace.put(rname, rdir);
                ReaderId reader = new ReaderId(rname, centre);
                Map<String, Path> byCase = new TreeMap<>();
                for (Path f : list(rdir, problems)) {
                    String fname = f.getFileName().toString();
                    if (skipName(f, fname, problems)) {
                        continue;
                    }
                    if (Files.isDirectory(f)) {
                        if (!usableFolder(f, root, rootReal, options, problems)) {
                            continue;
                        }
                        problems.add(StudyProblem.note(f, "ignored: folders inside a reader folder are not read"));
                        continue;
                    }
                    if (!Volumes.isVolumeFile(f)) {
                        problems.add(StudyProblem.note(f, "ignored: not a volume file"));
                        continue;
                    }
                    if (!insideRoot(f, root, rootReal, options, problems)) {
                        continue;
                    }
                    String caseId = Volumes.stem(f);
                    Path other = byCase.putIfAbsent(caseId, f);
                    if (other != null) {
                        problems.add(StudyProblem.error(f, "second mask for case '" + caseId + "' of reader "
                            + reader.label() + " (also " + other.getFileName() + "); only the first is used"));
                    }
                }
                if (byCase.isEmpty()) {
                    problems.add(StudyProblem.warning(rdir, "reader folder holds no masks; reader ignored"));
                    continue;
                }
                centreHasReader = true;
                readers.add(reader);
                for (Map.Entry<String, Path> e : byCase.entrySet()) {
                    cases.add(e.getKey());
                    masks.add(new MaskRef(e.getKey(), reader, e.getValue()));
                }
            }
            if (centreHasReader) {
                centres.add(centre);
            } else {
                problems.add(StudyProblem.warning(top, "centre folder holds no reader with masks; centre ignored"));
            }
        }
        for (String caseId : List.copyOf(images.keySet())) {
            if (!cases.contains(caseId)) {
                problems.add(StudyProblem.warning(images.get(caseId), "image of case '" + caseId + "' that has no mask; ignored"));
                images.remove(caseId);
            }
        }
        return new Study(root, null, List.copyOf(centres), List.copyOf(readers), List.copyOf(cases), masks, images, problems);
    }

    private static void collectImages(Path dir, Path root, Path rootReal, LoadOptions options,
                                      Map<String, Path> images, List<StudyProblem> problems) {
        for (Path f : list(dir, problems)) {
            String fname = f.getFileName().toString();
            if (skipName(f, fname, problems)) {
                continue;
            }
            if (Files.isDirectory(f) || !Volumes.isVolumeFile(f)) {
                problems.add(StudyProblem.note(f, "ignored: not a volume file"));
                continue;
            }
            if (!insideRoot(f, root, rootReal, options, problems)) {
                continue;
            }
            String caseId = Volumes.stem(f);
            Path other = images.putIfAbsent(caseId, f);
            if (other != null) {
                problems.add(StudyProblem.error(f, "second image for case '" + caseId + "' (also "
                    + other.getFileName() + "); only the first is used"));
            }
        }
    }

    /** Sorted entries of a folder; an unreadable folder becomes a problem and an empty list. */
    private static List<Path> list(Path dir, List<StudyProblem> problems) {
        List<Path> out = new ArrayList<>();
        try (DirectoryStream<Path> ds = Files.newDirectoryStream(dir)) {
            for (Path p : ds) {
                out.add(p);
            }
        } catch (IOException | RuntimeException e) {
            problems.add(StudyProblem.error(dir, "cannot list folder: " + e.getMessage()));
        }
        out.sort((a, b) -> a.getFileName().toString().compareTo(b.getFileName().toString()));
        return out;
    }

    /** True when the entry is hidden (skipped silently) or has an unusable name (reported). */
    private static boolean skipName(Path p, String name, List<StudyProblem> problems) {
        if (name.startsWith(".")) {
            return true;
        }
        if (name.indexOf('\uFFFD') >= 0) {
            problems.add(StudyProblem.warning(p, "ignored: file name is not valid text in the system encoding (UTF-8 expected)"));
            return true;
        }
        if (name.length() > MAX_NAME_LENGTH) {
            problems.add(StudyProblem.warning(p.getParent(), "ignored: a file name of " + name.length()
                + " characters (longest accepted " + MAX_NAME_LENGTH + "): " + name.substring(0, 40) + "..."));
            return true;
        }
        for (int i = 0; i < name.length(); i++) {
            if (Character.isISOControl(name.charAt(i))) {
                problems.add(StudyProblem.warning(p.getParent(), "ignored: a file name with control characters: "
                    + name.replaceAll("\\p{Cntrl}", "?")));
                return true;
            }
        }
        return false;
    }

    /**
     * A folder may be entered when it is not a symbolic link back to one of its ancestors (a
     * loop) and does not lead outside the root (unless allowed).
     */
    private static boolean usableFolder(Path dir, Path root, Path rootReal, LoadOptions options,
                                        List<StudyProblem> problems) {
        if (!Files.isSymbolicLink(dir)) {
            return true;
        }
        Path real;
        try {
            real = dir.toRealPath();
        } catch (IOException | RuntimeException e) {
            problems.add(StudyProblem.warning(dir, "ignored: symbolic link cannot be resolved (" + e.getMessage() + ")"));
            return false;
        }
        Path parentReal;
        try {
            parentReal = dir.getParent().toRealPath();
        } catch (IOException e) {
            parentReal = dir.getParent();
        }
        if (parentReal.startsWith(real)) {
            problems.add(StudyProblem.warning(dir, "ignored: symbolic link loop (leads back to " + real + ")"));
            return false;
        }
        if (!real.startsWith(rootReal) && !options.allowPathEscape()) {
            problems.add(StudyProblem.error(dir, "refused: symbolic link leads outside the study root to " + real
                + " (allow with --allow-outside-root)"));
            return false;
        }
        return true;
    }

    private static boolean insideRoot(Path f, Path root, Path rootReal, LoadOptions options, List<StudyProblem> problems) {
        String escape = escapeProblem(f, root, rootReal);
        if (escape != null && !options.allowPathEscape()) {
            problems.add(StudyProblem.error(f, "refused: " + escape + " (allow with --allow-outside-root)"));
            return false;
        }
        return true;
    }

    /** Why a path leaves the root (after normalisation, then after resolving links), or null. */
    static String escapeProblem(Path p, Path root, Path rootReal) {
        Path norm = p.toAbsolutePath().normalize();
        if (!norm.startsWith(root)) {
            return "path leads outside the study root " + root;
        }
        try {
            // one system call for a missing file (10^6 manifest rows naming missing files are normal input)
            Files.readAttributes(norm, java.nio.file.attribute.BasicFileAttributes.class, LinkOption.NOFOLLOW_LINKS);
        } catch (IOException e) {
            return null; // missing or unreadable: reported when the file is read
        }
        try {
            Path real = norm.toRealPath();
            if (!real.startsWith(rootReal)) {
                return "path resolves through a symbolic link outside the study root to " + real;
            }
        } catch (IOException e) {
            return null; // a dangling link or unreadable: reported when the file is read
        }
        return null;
    }

    private static Path realPath(Path root) throws InputException {
        try {
            return root.toRealPath();
        } catch (IOException e) {
            throw new InputException(root, "cannot resolve the study folder: " + e.getMessage());
        }
    }

    // ---------------------------------------------------------------- manifest

    /** Loads a study from a manifest CSV; its folder is the study root. */
    public static Study loadManifest(Path manifestFile, LoadOptions options) throws InputException {
        Path manifest = manifestFile.toAbsolutePath().normalize();
        Path root = manifest.getParent();
        Path rootReal = realPath(root);
        CharsetDecoder decoder = StandardCharsets.UTF_8.newDecoder()
            .onMalformedInput(CodingErrorAction.REPORT)
            .onUnmappableCharacter(CodingErrorAction.REPORT);
        CSVFormat format = CSVFormat.DEFAULT.builder()
            .setHeader()
            .setSkipHeaderRecord(true)
            .setIgnoreSurroundingSpaces(true)
            .setIgnoreEmptyLines(true)
            .setAllowMissingColumnNames(false)
            .setDuplicateHeaderMode(DuplicateHeaderMode.DISALLOW)
            .get();

        // hash sets while reading (10^6 rows); the Study sorts them once
        Set<String> centres = new java.util.HashSet<>();
        Set<ReaderId> readers = new java.util.HashSet<>();
        Set<String> cases = new java.util.HashSet<>();
        List<MaskRef> masks = new ArrayList<>();
        Map<String, Path> images = new TreeMap<>();
        Map<String, String> readerCentre = new HashMap<>();
        Map<String, Long> readerLine = new HashMap<>();
        Map<String, Long> pairLine = new HashMap<>();
        Map<String, Long> imageLine = new HashMap<>();

        InputFiles.requireRegular(manifest);
        String text;
        try {
            if (Files.size(manifest) > MAX_MANIFEST_BYTES) {
                throw new InputException(manifest, "manifest larger than " + MAX_MANIFEST_BYTES + " bytes");
            }
            text = decoder.decode(java.nio.ByteBuffer.wrap(Files.readAllBytes(manifest))).toString();
            if (text.startsWith("\uFEFF")) {
                // a UTF-8 byte-order mark, as spreadsheet programs write it: not part of the first column's name
                text = " " + text.substring(1);
            }
        } catch (CharacterCodingException e) {
            throw new InputException(manifest, "not valid UTF-8 text", e);
        } catch (IOException e) {
            throw new InputException(manifest, "cannot read manifest: " + oneLine(e.getMessage()), e);
        }
        int[] lineStarts = lineStarts(text);
        try (Reader in = new java.io.StringReader(text);
             CSVParser parser = CSVParser.builder().setReader(in).setFormat(format).get()) {
            List<String> header = parser.getHeaderNames();
            if (header.isEmpty()) {
                throw new InputException(manifest, "line 1: missing header row (expected columns case,centre,reader,path[,image])");
            }
            for (String h : header) {
                if (!REQUIRED.contains(h) && !h.equals(OPTIONAL_IMAGE)) {
                    throw new InputException(manifest, "line 1: unknown column '" + org.accordia.io.Messages.clip(h, 80)
                        + "' (expected columns case,centre,reader,path and optionally image)");
                }
            }
            for (String r : REQUIRED) {
                if (!header.contains(r)) {
                    throw new InputException(manifest, "line 1: missing column '" + r
                        + "' in the header (expected columns case,centre,reader,path and optionally image)");
                }
            }
            boolean hasImage = header.contains(OPTIONAL_IMAGE);
            for (CSVRecord rec : parser) {
                long line = lineOf(lineStarts, firstContent(text, rec.getCharacterPosition()));
                if (rec.size() < header.size()) {
                    throw new InputException(manifest, "line " + line + ": " + rec.size() + " column(s), expected "
                        + header.size() + " (" + String.join(",", header) + ")");
                }
                if (rec.size() > header.size()) {
                    throw new InputException(manifest, "line " + line + ": " + rec.size() + " columns, expected "
                        + header.size() + " (" + String.join(",", header) + ")");
                }
                String caseId = field(manifest, rec, "case", line);
                String centre = field(manifest, rec, "centre", line);
                String readerName = field(manifest, rec, "reader", line);
                String pathText = field(manifest, rec, "path", line);
                String knownCentre = readerCentre.putIfAbsent(readerName, centre);
                if (knownCentre != null && !knownCentre.equals(centre)) {
                    throw new InputException(manifest, "line " + line + ": reader '" + readerName + "' is listed under centre '"
                        + centre + "' here and under centre '" + knownCentre + "' at line " + readerLine.get(readerName)
                        + " (a reader belongs to exactly one centre)");
                }
                readerLine.putIfAbsent(readerName, line);
                Long firstPair = pairLine.putIfAbsent(caseId + "\u0000" + readerName, line);
                if (firstPair != null) {
                    throw new InputException(manifest, "line " + line + ": duplicate row for case '" + caseId
                        + "' and reader '" + readerName + "' (first at line " + firstPair + ")");
                }
                Path mask = resolve(manifest, root, rootReal, pathText, line, "path", options);
                ReaderId reader = new ReaderId(readerName, centre);
                centres.add(centre);
                readers.add(reader);
                cases.add(caseId);
                masks.add(new MaskRef(caseId, reader, mask));
                if (hasImage) {
                    String imageText = rec.get(OPTIONAL_IMAGE);
                    if (imageText != null && !imageText.isEmpty()) {
                        Path image = resolve(manifest, root, rootReal, imageText, line, "image", options);
                        Path known = images.putIfAbsent(caseId, image);
                        if (known != null && !known.equals(image)) {
                            throw new InputException(manifest, "line " + line + ": case '" + caseId + "' has image '"
                                + imageText + "' here but " + known + " at line " + imageLine.get(caseId));
                        }
                        imageLine.putIfAbsent(caseId, line);
                    }
                }
            }
        } catch (InputException e) {
            throw e;
        } catch (IOException | RuntimeException e) {
            // commons-csv reports malformed quoting and duplicate header names this way
            throw new InputException(manifest, "malformed CSV: " + oneLine(innermostMessage(e)), e);
        }
        if (masks.isEmpty()) {
            return new Study(root, manifest, List.of(), List.of(), List.of(), List.of(), Map.of(),
                List.of(StudyProblem.error(manifest, "manifest lists no masks")));
        }
        return new Study(root, manifest, List.copyOf(centres), List.copyOf(readers), List.copyOf(cases), masks, images, List.of());
    }

    /** Offsets at which each line starts (line 1 at offset 0). */
    private static int[] lineStarts(String text) {
        List<Integer> starts = new ArrayList<>();
        starts.add(0);
        for (int i = 0; i < text.length(); i++) {
            char ch = text.charAt(i);
            if (ch == '\n' || (ch == '\r' && (i + 1 >= text.length() || text.charAt(i + 1) != '\n'))) {
                starts.add(i + 1);
            }
        }
        return starts.stream().mapToInt(Integer::intValue).toArray();
    }

    /** The first offset at or after {@code pos} that is not blank (empty lines before a record). */
    private static long firstContent(String text, long pos) {
        int p = (int) pos;
        while (p < text.length() && " \t\r\n".indexOf(text.charAt(p)) >= 0) {
            p++;
        }
        return p;
    }

    /** 1-based line holding a character offset. */
    private static long lineOf(int[] starts, long offset) {
        int idx = java.util.Arrays.binarySearch(starts, (int) offset);
        return idx >= 0 ? idx + 1 : -idx - 1;
    }

    private static String field(Path manifest, CSVRecord rec, String column, long line) throws InputException {
        String v = rec.get(column);
        if (v == null || v.isEmpty()) {
            throw new InputException(manifest, "line " + line + ": empty '" + column + "'");
        }
        return v;
    }

    private static Path resolve(Path manifest, Path root, Path rootReal, String text, long line, String column,
                                LoadOptions options) throws InputException {
        Path p;
        try {
            p = root.resolve(text).toAbsolutePath().normalize();
        } catch (InvalidPathException e) {
            throw new InputException(manifest, "line " + line + ": invalid " + column + " '" + text + "'");
        }
        String escape = escapeProblem(p, root, rootReal);
        if (escape != null && !options.allowPathEscape()) {
            throw new InputException(manifest, "line " + line + ": " + column + " '" + text + "': " + escape
                + " (allow with --allow-outside-root)");
        }
        return p;
    }

    /**
     * The message of the innermost cause that has one: commons-csv wraps its parse error in an
     * UncheckedIOException whose own message starts with the exception's class name.
     */
    private static String innermostMessage(Throwable e) {
        String m = e.getMessage();
        for (Throwable c = e.getCause(); c != null && c != c.getCause(); c = c.getCause()) {
            if (c.getMessage() != null) {
                m = c.getMessage();
            }
        }
        return m;
    }

    private static String oneLine(String s) {
        return s == null ? "" : s.replace('\n', ' ').replace('\r', ' ');
    }
}
