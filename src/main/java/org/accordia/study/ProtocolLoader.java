package org.accordia.study;

import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.io.Reader;
import java.math.BigInteger;
import java.nio.charset.CharsetDecoder;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.accordia.io.InputException;
import org.yaml.snakeyaml.LoaderOptions;
import org.yaml.snakeyaml.Yaml;
import org.yaml.snakeyaml.constructor.SafeConstructor;
import org.yaml.snakeyaml.error.MarkedYAMLException;
import org.yaml.snakeyaml.error.YAMLException;

/**
 * Reads a protocol file (YAML, schema in docs/protocol.md) into a {@link Protocol}.
 *
 * <p>Safe by construction: only plain maps, lists and scalars are built ({@link SafeConstructor});
 * duplicate keys, more than {@value #MAX_ALIASES} aliases for collections (an alias "bomb"),
 * nesting deeper than {@value #MAX_NESTING} and files over {@value #MAX_CODE_POINTS} code points
 * are refused. Unknown keys anywhere are errors naming the key's path (e.g. {@code shift.alpa});
 * a value of the wrong type names the key and the expected type; a value out of range names the
 * key and the range. Every message names the file.
 */
public final class ProtocolLoader {
    public static final int MAX_ALIASES = 50;
    public static final int MAX_NESTING = 20;
    public static final int MAX_CODE_POINTS = 1_000_000;
    /**
     * The most {@code bootstrap_resamples} and {@code permutations}: a p-value resolution of
     * 10^-5, beyond what any study needs; larger counts only cost hours and memory, and were
     * accepted and then failed with an out-of-memory message that blamed the volumes.
     */
    public static final int MAX_RESAMPLES = 100_000;

    private ProtocolLoader() {
    }

    public static Protocol load(Path file) throws InputException {
        String problem = org.accordia.io.InputFiles.problem(file); // never opens a named pipe or device
        if (problem != null) {
            throw new InputException(file, problem.equals("file not found") ? "protocol file not found" : "protocol: " + problem);
        }
        try {
            if (Files.size(file) > 4L * MAX_CODE_POINTS) {
                throw new InputException(file, "protocol file too large (at most " + MAX_CODE_POINTS + " characters)");
            }
        } catch (IOException e) {
            throw new InputException(file, "cannot read protocol: " + e.getMessage(), e);
        }
        Object doc;
        try (InputStream in = Files.newInputStream(file)) {
            doc = parse(in);
        } catch (YAMLException e) {
            throw new InputException(file, "not a valid protocol file: " + describe(e), e);
        } catch (IOException e) {
            throw new InputException(file, "cannot read protocol: " + e.getMessage(), e);
        }
        return fromTree(file, doc);
    }

    /** Parses YAML text with the safety limits above (tests use this directly). */
    static Object parse(InputStream in) {
        LoaderOptions lo = new LoaderOptions();
        lo.setMaxAliasesForCollections(MAX_ALIASES);
        lo.setAllowDuplicateKeys(false);
        lo.setCodePointLimit(MAX_CODE_POINTS);
        lo.setNestingDepthLimit(MAX_NESTING);
        lo.setAllowRecursiveKeys(false);
        Yaml yaml = new Yaml(new SafeConstructor(lo));
        CharsetDecoder decoder = StandardCharsets.UTF_8.newDecoder()
            .onMalformedInput(CodingErrorAction.REPORT)
            .onUnmappableCharacter(CodingErrorAction.REPORT);
        Reader r = new InputStreamReader(in, decoder);
        return yaml.load(r);
    }

    /** Builds and validates a protocol from a parsed YAML tree. */
    static Protocol fromTree(Path file, Object doc) throws InputException {
        Protocol d = Protocol.defaults();
        if (doc == null) {
            return d;
        }
        Node root = new Node(file, "", doc);
        Map<String, Object> top = root.map("study", "structures", "geometry_tolerance_mm", "max_voxels", "seed",
            "agreement", "consensus", "shift", "review");
        String study = root.has(top, "study") ? root.child(top, "study").string() : d.study();
        List<Structure> structures = root.has(top, "structures") ? structures(root.child(top, "structures")) : d.structures();
        double geomTol = root.has(top, "geometry_tolerance_mm")
            ? root.child(top, "geometry_tolerance_mm").positive() : d.geometryToleranceMm();
        long maxVoxels = d.maxVoxels();
        if (root.has(top, "max_voxels")) {
            Node n = root.child(top, "max_voxels");
            maxVoxels = n.integer();
            if (maxVoxels < 1 || maxVoxels > d.maxVoxels()) {
                throw n.fail("must lie between 1 and " + d.maxVoxels() + ", got " + maxVoxels);
            }
        }
        long seed = root.has(top, "seed") ? root.child(top, "seed").integer() : d.seed();

        Protocol.Agreement agreement = d.agreement();
        if (root.has(top, "agreement")) {
            Node n = root.child(top, "agreement");
            Map<String, Object> m = n.map("hd95");
            Protocol.Hd95Mode mode = n.has(m, "hd95")
                ? n.child(m, "hd95").choice(Protocol.Hd95Mode.values(), Protocol.Hd95Mode::key) : agreement.hd95();
            agreement = new Protocol.Agreement(mode);
        }
        Protocol.Consensus consensus = d.consensus();
        if (root.has(top, "consensus")) {
            Node n = root.child(top, "consensus");
            Map<String, Object> m = n.map("region", "bootstrap_resamples");
            Protocol.ConsensusRegion region = n.has(m, "region")
                ? n.child(m, "region").choice(Protocol.ConsensusRegion.values(), Protocol.ConsensusRegion::key)
                : consensus.region();
            int resamples = n.has(m, "bootstrap_resamples")
                ? n.child(m, "bootstrap_resamples").intBetween(100, MAX_RESAMPLES) : consensus.bootstrapResamples();
            consensus = new Protocol.Consensus(region, resamples);
        }
        Protocol.Shift shift = d.shift();
        if (root.has(top, "shift")) {
            Node n = root.child(top, "shift");
            Map<String, Object> m = n.map("distance", "alpha", "permutations", "minimum_shift_mm",
                "minimum_volume_shift_percent");
            Protocol.ShiftDistance dist = n.has(m, "distance")
                ? n.child(m, "distance").choice(Protocol.ShiftDistance.values(), Protocol.ShiftDistance::key)
                : shift.distance();
            double alpha = shift.alpha();
            if (n.has(m, "alpha")) {
                Node a = n.child(m, "alpha");
                alpha = a.number();
                if (!(alpha > 0 && alpha < 1)) {
                    throw a.fail("must lie strictly between 0 and 1, got " + alpha);
                }
            }
            int perms = n.has(m, "permutations") ? n.child(m, "permutations").intBetween(99, MAX_RESAMPLES) : shift.permutations();
            double minShift = n.has(m, "minimum_shift_mm") ? n.child(m, "minimum_shift_mm").nonNegative() : shift.minimumShiftMm();
            double minVol = n.has(m, "minimum_volume_shift_percent")
                ? n.child(m, "minimum_volume_shift_percent").nonNegative() : shift.minimumVolumeShiftPercent();
            shift = new Protocol.Shift(dist, alpha, perms, minShift, minVol);
        }
        Protocol.Review review = d.review();
        if (root.has(top, "review")) {
            Node n = root.child(top, "review");
            Map<String, Object> m = n.map("adjudication_dice", "adjudication_hd95_mm", "recalibration_tolerance_mm",
                "recalibration_volume_percent", "adjudication_share_for_review");
            double dice = review.adjudicationDice();
            if (n.has(m, "adjudication_dice")) {
                Node a = n.child(m, "adjudication_dice");
                dice = a.number();
                if (!(dice >= 0 && dice <= 1)) {
                    throw a.fail("must lie between 0 and 1, got " + dice);
                }
            }
            double hd = n.has(m, "adjudication_hd95_mm") ? n.child(m, "adjudication_hd95_mm").positive() : review.adjudicationHd95Mm();
            double recalMm = n.has(m, "recalibration_tolerance_mm")
                ? n.child(m, "recalibration_tolerance_mm").positive() : review.recalibrationToleranceMm();
            double recalVol = n.has(m, "recalibration_volume_percent")
                ? n.child(m, "recalibration_volume_percent").positive() : review.recalibrationVolumePercent();
            double share = review.adjudicationShareForReview();
            if (n.has(m, "adjudication_share_for_review")) {
                Node a = n.child(m, "adjudication_share_for_review");
                share = a.number();
                if (!(share > 0 && share <= 1)) {
                    throw a.fail("must lie in (0, 1], got " + share);
                }
            }
            review = new Protocol.Review(dice, hd, recalMm, recalVol, share);
        }
        return new Protocol(study, structures, geomTol, maxVoxels, seed, agreement, consensus, shift, review);
    }

    private static List<Structure> structures(Node list) throws InputException {
        List<Object> items = list.list();
        if (items.isEmpty()) {
            throw list.fail("must list at least one structure (leave the key out for one structure per label)");
        }
        List<Structure> out = new ArrayList<>();
        Map<String, String> names = new LinkedHashMap<>();
        for (int i = 0; i < items.size(); i++) {
            Node s = list.item(i, items.get(i));
            Map<String, Object> m = s.map("name", "labels", "tolerance_mm");
            if (!s.has(m, "name")) {
                throw s.fail("missing key 'name'");
            }
            if (!s.has(m, "labels")) {
                throw s.fail("missing key 'labels'");
            }
            Node nameNode = s.child(m, "name");
            String name = nameNode.string().trim();
            if (name.isEmpty()) {
                throw nameNode.fail("must not be empty");
            }
            String earlier = names.putIfAbsent(name, s.path);
            if (earlier != null) {
                throw nameNode.fail("structure name '" + name + "' is already used by " + earlier);
            }
            Node labelsNode = s.child(m, "labels");
            List<Integer> labels = new ArrayList<>();
            if (labelsNode.value instanceof List<?> l) {
                if (l.isEmpty()) {
                    throw labelsNode.fail("must list at least one label value");
                }
                for (int j = 0; j < l.size(); j++) {
                    Node ln = labelsNode.item(j, l.get(j));
                    int v = ln.intBetween(1, CaseLoader.MAX_LABEL);
                    if (labels.contains(v)) {
                        throw ln.fail("label " + v + " is listed twice");
                    }
                    labels.add(v);
                }
            } else {
                labels.add(labelsNode.intBetween(1, CaseLoader.MAX_LABEL));
            }
            double tol = s.has(m, "tolerance_mm") ? s.child(m, "tolerance_mm").positive() : Structure.DEFAULT_TOLERANCE_MM;
            out.add(new Structure(name, labels, tol));
        }
        return out;
    }

    /** One line from a parser error: the problem and where, without the source excerpt. */
    private static String describe(YAMLException e) {
        if (e instanceof MarkedYAMLException m && m.getProblem() != null) {
            String where = m.getProblemMark() == null ? ""
                : " (line " + (m.getProblemMark().getLine() + 1) + ", column " + (m.getProblemMark().getColumn() + 1) + ")";
            return m.getProblem().strip().replaceAll("\\s+", " ") + where;
        }
        String msg = e.getMessage() == null ? "parse error" : e.getMessage().strip();
        int nl = msg.indexOf('\n');
        return nl < 0 ? msg : msg.substring(0, nl);
    }

    /** A value in the YAML tree with its dotted path, for messages. */
    private static final class Node {
        final Path file;
        final String path;
        final Object value;

        Node(Path file, String path, Object value) {
            this.file = file;
            this.path = path;
            this.value = value;
        }

        InputException fail(String problem) {
            return new InputException(file, (path.isEmpty() ? "document" : path) + ": " + problem);
        }

        String describe() {
            if (value == null) {
                return "nothing (null)";
            }
            if (value instanceof Map) {
                return "a mapping";
            }
            if (value instanceof List) {
                return "a list";
            }
            if (value instanceof Boolean b) {
                return "the boolean " + b;
            }
            if (value instanceof String s) {
                return "the text \"" + (s.length() > 40 ? s.substring(0, 40) + "..." : s) + "\"";
            }
            return "the number " + value;
        }

        @SuppressWarnings("unchecked")
        Map<String, Object> map(String... allowed) throws InputException {
            if (!(value instanceof Map<?, ?> m)) {
                throw fail("expected a mapping of keys, got " + describe());
            }
            List<String> ok = List.of(allowed);
            for (Object k : m.keySet()) {
                if (!(k instanceof String ks)) {
                    throw fail("key " + k + " is not text");
                }
                if (!ok.contains(ks)) {
                    throw new InputException(file, (path.isEmpty() ? "" : path + ".") + ks
                        + ": unknown key (allowed here: " + String.join(", ", allowed) + ")");
                }
            }
            return (Map<String, Object>) m;
        }

        boolean has(Map<String, Object> m, String key) {
            return m.containsKey(key);
        }

        Node child(Map<String, Object> m, String key) {
            return new Node(file, path.isEmpty() ? key : path + "." + key, m.get(key));
        }

        Node item(int index, Object v) {
            return new Node(file, path + "[" + index + "]", v);
        }

        @SuppressWarnings("unchecked")
        List<Object> list() throws InputException {
            if (!(value instanceof List<?> l)) {
                throw fail("expected a list, got " + describe());
            }
            return (List<Object>) l;
        }

        String string() throws InputException {
            if (!(value instanceof String s)) {
                throw fail("expected text, got " + describe());
            }
            return s;
        }

        double number() throws InputException {
            if (value instanceof Boolean || !(value instanceof Number n)) {
                throw fail("expected a number, got " + describe());
            }
            double v = n.doubleValue();
            if (!Double.isFinite(v)) {
                throw fail("expected a finite number, got " + value);
            }
            return v;
        }

        double positive() throws InputException {
            double v = number();
            if (!(v > 0)) {
                throw fail("must be positive, got " + v);
            }
            return v;
        }

        double nonNegative() throws InputException {
            double v = number();
            if (!(v >= 0)) {
                throw fail("must be at least 0, got " + v);
            }
            return v;
        }

        long integer() throws InputException {
            if (value instanceof Integer || value instanceof Long) {
                return ((Number) value).longValue();
            }
            if (value instanceof BigInteger) {
                throw fail("integer out of range: " + value);
            }
            throw fail("expected an integer, got " + describe());
        }

        int intBetween(int min, int max) throws InputException {
            long v = integer();
            if (v < min || v > max) {
                throw fail("must be an integer between " + min + " and " + max + ", got " + v);
            }
            return (int) v;
        }

        <E extends Enum<E>> E choice(E[] values, java.util.function.Function<E, String> key) throws InputException {
            String s = string();
            List<String> names = new ArrayList<>();
            for (E e : values) {
                if (key.apply(e).equals(s)) {
                    return e;
                }
                names.add(key.apply(e));
            }
            throw fail("unknown value \"" + s + "\" (expected one of: " + String.join(", ", names) + ")");
        }
    }
}
