package org.accordia.hostile;

import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.io.StringReader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.HexFormat;
import java.util.List;
import java.util.Locale;
import java.util.TreeMap;
import java.util.regex.Pattern;
import java.util.stream.Stream;
import org.accordia.io.InputException;
import org.accordia.io.ReadLimits;
import org.accordia.io.Volumes;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;

/** Checks on an output folder and on a study's files, shared by the analyze tests. */
final class OutputChecks {
    /** Our temporary names ({@code OutputFolder}): {@code .NAME.partial-<32 hex>}. */
    static final Pattern TEMPORARY = Pattern.compile("^\\..+\\.partial-[0-9a-f]{32}$");

    private OutputChecks() {
    }

    /**
     * SHA-256 of every regular file under {@code root}, keyed by relative path, plus every folder
     * and link with its kind, size and modification time: equal before and after a run means no
     * input was added, removed, rewritten or touched.
     */
    static TreeMap<String, String> fingerprint(Path root) throws IOException {
        TreeMap<String, String> out = new TreeMap<>();
        try (Stream<Path> walk = Files.walk(root)) {
            for (Path p : walk.toList()) {
                String rel = root.relativize(p).toString();
                if (Files.isSymbolicLink(p)) {
                    out.put(rel, "link -> " + Files.readSymbolicLink(p));
                } else if (Files.isDirectory(p)) {
                    out.put(rel, "dir " + Files.getLastModifiedTime(p));
                } else {
                    out.put(rel, "file " + Files.size(p) + " " + Files.getLastModifiedTime(p) + " " + sha256(Files.readAllBytes(p)));
                }
            }
        }
        return out;
    }

    static String sha256(byte[] b) {
        try {
            return HexFormat.of().formatHex(MessageDigest.getInstance("SHA-256").digest(b));
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException(e);
        }
    }

    /** Every regular file under {@code dir}, relative paths, sorted. */
    static List<Path> files(Path dir) throws IOException {
        if (!Files.exists(dir)) {
            return List.of();
        }
        try (Stream<Path> walk = Files.walk(dir)) {
            return walk.filter(Files::isRegularFile).map(dir::relativize).sorted().toList();
        }
    }

    /**
     * Every file under a final name in {@code out} is complete: CSVs parse, have a header and end
     * with a newline; JSON parses; NIfTI volumes read; HTML ends with its closing tag; PNGs end
     * with the IEND chunk. Temporaries are skipped (they are not outputs). Returns the number of
     * files checked.
     */
    static int assertEveryFinalFileComplete(Path out) throws IOException {
        int checked = 0;
        for (Path rel : files(out)) {
            Path p = out.resolve(rel);
            String name = p.getFileName().toString();
            if (TEMPORARY.matcher(name).matches()) {
                continue;
            }
            checked++;
            String lower = name.toLowerCase(Locale.ROOT);
            byte[] bytes = Files.readAllBytes(p);
            if (lower.endsWith(".csv")) {
                String text = new String(bytes, StandardCharsets.UTF_8);
                assertTrue(text.endsWith("\n"), rel + ": CSV does not end with a newline");
                try (CSVParser parser = CSVParser.parse(new StringReader(text), CSVFormat.RFC4180)) {
                    List<CSVRecord> rows = parser.getRecords();
                    assertTrue(!rows.isEmpty(), rel + ": CSV without a header row");
                    int width = rows.get(0).size();
                    for (CSVRecord r : rows) {
                        assertTrue(r.size() == width, rel + ": row " + r.getRecordNumber() + " has " + r.size()
                            + " cells, the header " + width);
                    }
                }
            } else if (lower.endsWith(".json")) {
                new ObjectMapper().readTree(bytes);
            } else if (lower.endsWith(".nii") || lower.endsWith(".nii.gz")) {
                try {
                    Volumes.readImage(p, ReadLimits.DEFAULT);
                } catch (InputException e) {
                    fail(rel + ": incomplete volume: " + e.getMessage());
                }
            } else if (lower.endsWith(".html")) {
                String text = new String(bytes, StandardCharsets.UTF_8).strip();
                assertTrue(text.toLowerCase(Locale.ROOT).endsWith("</html>"), rel + ": HTML without its closing tag");
            } else if (lower.endsWith(".png")) {
                assertTrue(bytes.length > 12 && new String(bytes, bytes.length - 8, 4, StandardCharsets.ISO_8859_1).equals("IEND"),
                    rel + ": PNG without its IEND chunk");
            }
        }
        return checked;
    }
}
