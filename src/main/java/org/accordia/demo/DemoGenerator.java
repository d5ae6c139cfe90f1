package org.accordia.demo;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.DirectoryStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.SplittableRandom;
import java.util.TreeSet;
import org.accordia.io.Geometry;
import org.accordia.io.ImageVolume;
import org.accordia.io.InputException;
import org.accordia.io.LabelVolume;
import org.accordia.io.NiftiWriter;

/**
 * Writes a synthetic multi-centre study (scenario in docs/demo.md): the folder layout
 * {@code <out>/<centre>/<reader>/<case>.nii.gz}, a phantom image per case in
 * {@code <out>/images/<case>.nii.gz}, {@code manifest.csv} and {@code demo-truth.json}.
 *
 * <p>Shape model. Each case has a truth shape given by a signed-distance-like function
 * {@code f(x)} in millimetres (negative inside): a rotated ellipsoid, optionally united (minimum)
 * with a small second ellipsoid, plus a smooth low-frequency deformation. For an ellipsoid with
 * semi-axes a, b, c, {@code f = (rho - 1) * g} with {@code rho} the ellipsoidal radius and
 * {@code g = cbrt(abc)}, so {@code f < m} grows the shape by about m mm. Reader r of centre c draws
 * {@code { f(x) < shift_c + bias_r + noise_r(x) }}, where the noise is a smooth random field (a
 * coarse Gaussian grid, trilinearly interpolated), never per-voxel white noise. A core (label 2)
 * is {@code { f1(x) + depth < threshold }}, hence always inside the reader's lesion (label 1).
 *
 * <p>Speed: the shape function is evaluated only inside a bounding box that provably contains
 * every reader's foreground; each reader's noise is a precomputed coarse grid.
 *
 * <p>Deterministic: every random draw derives from {@link DemoSpec#seed()}; output files are
 * byte-identical for the same specification.
 */
public final class DemoGenerator {
    /** Fictional centres and countries, used in this order. */
    private static final String[][] CENTRES = {
        {"esterhaven", "Esterland"},
        {"norvale", "Norvalia"},
        {"quillbay", "Quillonia"},
        {"brimholt", "Brimmark"},
        {"calderin", "Caldoria"},
        {"fennick", "Fennmark"},
    };

    private static final double HARD_NOISE_MM = 3.0;
    private static final double HARD_BIAS_MM = 2.5;

    /** The protocol written into every generated study (the same text as protocols/demo.yaml). */
    public static final String PROTOCOL_FILE = "protocol.yaml";
    private static final String PROTOCOL_RESOURCE = "protocol.yaml";

    private DemoGenerator() {
    }

    /**
     * The demo study's protocol: the classpath resource {@code org/accordia/demo/protocol.yaml},
     * the one source of {@code protocols/demo.yaml} (a test checks they are identical).
     */
    public static String protocolYaml() {
        try (var in = DemoGenerator.class.getResourceAsStream(PROTOCOL_RESOURCE)) {
            if (in == null) {
                throw new IllegalStateException("resource " + PROTOCOL_RESOURCE + " is missing from the build");
            }
            return new String(in.readAllBytes(), StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new java.io.UncheckedIOException(e);
        }
    }

    /** Centre names for a spec, in order. */
    static List<String> centreNames(int n) {
        List<String> out = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            out.add(i < CENTRES.length ? CENTRES[i][0] : String.format(Locale.ROOT, "centre%02d", i + 1));
        }
        return out;
    }

    static String countryOf(int i) {
        return (i < CENTRES.length ? CENTRES[i][1] : "Country " + (i + 1)) + " (fictional)";
    }

    static String readerName(String centre, int k) {
        return centre.substring(0, Math.min(3, centre.length())) + (k + 1);
    }

    static String caseName(int c, int cases) {
        int width = Math.max(2, String.valueOf(cases).length());
        return String.format(Locale.ROOT, "case%0" + width + "d", c + 1);
    }

    /**
     * SplitMix64 finaliser of the seed and the parts, so every stream is independent; also used
     * to derive the seeds of simulated studies.
     */
    public static long mix(long seed, long... parts) {
        long h = seed;
        for (long p : parts) {
            h += 0x9E3779B97F4A7C15L * (p + 1);
            long z = h;
            z = (z ^ (z >>> 30)) * 0xBF58476D1CE4E5B9L;
            z = (z ^ (z >>> 27)) * 0x94D049BB133111EBL;
            h = z ^ (z >>> 31);
        }
        return h;
    }

    /**
     * Generates the study into {@code outDir}, which must not exist or be empty.
     *
     * @return what was planted (also written as demo-truth.json)
     */
    public static DemoTruth generate(DemoSpec spec, Path outDir) throws IOException, InputException {
        return generate(spec, outDir, 1);
    }

    /**
     * Generates the study with cases spread over {@code threads} workers (each case's files are
     * independent, so the output is the same whatever the thread count). Memory: about ten
     * volumes per worker.
     */
    public static DemoTruth generate(DemoSpec spec, Path outDir, int threads) throws IOException, InputException {
        if (Files.exists(outDir)) {
            if (!Files.isDirectory(outDir)) {
                throw new InputException(outDir, "output exists and is not a folder");
            }
            try (DirectoryStream<Path> ds = Files.newDirectoryStream(outDir)) {
                if (ds.iterator().hasNext()) {
                    throw new InputException(outDir, "output folder is not empty (choose a new folder or remove it)");
                }
            }
        }
        Files.createDirectories(outDir);
        Plan plan = plan(spec);
        Geometry geometry = Geometry.axisAligned(spec.nx(), spec.ny(), spec.nz(), spec.sxMm(), spec.syMm(), spec.szMm());
        for (Reader r : plan.readers) {
            Files.createDirectories(outDir.resolve(r.centre).resolve(r.name));
        }
        Files.createDirectories(outDir.resolve("images"));
        StringBuilder manifest = new StringBuilder("case,centre,reader,path,image\n");
        for (int c = 0; c < spec.cases(); c++) {
            String caseId = plan.caseIds.get(c);
            for (Reader rd : plan.readers) {
                manifest.append(caseId).append(',').append(rd.centre).append(',').append(rd.name).append(',')
                    .append(rd.centre).append('/').append(rd.name).append('/').append(caseId).append(".nii.gz,")
                    .append("images/").append(caseId).append(".nii.gz\n");
            }
        }
        int workers = Math.max(1, Math.min(threads, spec.cases()));
        java.util.concurrent.ExecutorService pool = java.util.concurrent.Executors.newFixedThreadPool(workers, r -> {
            Thread t = new Thread(r, "accordia-demo");
            t.setDaemon(true);
            return t;
        });
        try {
            List<java.util.concurrent.Future<Void>> done = new ArrayList<>();
            for (int c = 0; c < spec.cases(); c++) {
                int caseIndex = c;
                done.add(pool.submit(() -> {
                    writeCase(spec, plan, caseIndex, geometry, outDir);
                    return null;
                }));
            }
            for (java.util.concurrent.Future<Void> f : done) {
                f.get();
            }
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IOException("interrupted", e);
        } catch (java.util.concurrent.ExecutionException e) {
            if (e.getCause() instanceof IOException io) {
                throw io;
            }
            if (e.getCause() instanceof RuntimeException re) {
                throw re;
            }
            throw new IllegalStateException(e.getCause());
        } finally {
            pool.shutdownNow();
        }
        writeAtomically(outDir.resolve("manifest.csv"), manifest.toString());
        writeAtomically(outDir.resolve(PROTOCOL_FILE), protocolYaml());
        DemoTruth truth = plan.truth;
        writeAtomically(outDir.resolve(DemoTruth.FILE_NAME), DemoTruth.mapper().writeValueAsString(truth) + "\n");
        return truth;
    }

    /**
     * The study of {@code spec} held in memory: nothing is written, each case is generated when
     * asked for (the same masks, bit for bit, as the files {@link #generate} writes). Thread-safe.
     */
    public static InMemory inMemory(DemoSpec spec) {
        return inMemory(spec, ExtraPlants.NONE);
    }

    /**
     * The study of {@code spec} with the extra plants of simulations (unequal rosters, one wide
     * reader, a local inclusion at one centre), held in memory; {@link ExtraPlants#NONE} gives the
     * same study as {@link #inMemory(DemoSpec)}.
     */
    public static InMemory inMemory(DemoSpec spec, ExtraPlants extras) {
        return new InMemory(spec, plan(spec, extras),
            Geometry.axisAligned(spec.nx(), spec.ny(), spec.nz(), spec.sxMm(), spec.syMm(), spec.szMm()));
    }

    /** A generated study in memory (see {@link #inMemory(DemoSpec)}). */
    public static final class InMemory {
        private final DemoSpec spec;
        private final Plan plan;
        private final Geometry geometry;

        private InMemory(DemoSpec spec, Plan plan, Geometry geometry) {
            this.spec = spec;
            this.plan = plan;
            this.geometry = geometry;
        }

        public DemoSpec spec() {
            return spec;
        }

        /** What was planted. */
        public DemoTruth truth() {
            return plan.truth;
        }

        /** Case identifiers, sorted. */
        public List<String> caseIds() {
            return plan.caseIds;
        }

        /** Every reader, sorted by centre then name. */
        public List<org.accordia.study.ReaderId> readers() {
            return plan.readers.stream().map(r -> new org.accordia.study.ReaderId(r.name, r.centre)).sorted().toList();
        }

        /** One case's masks, readers sorted by centre then name. */
        public org.accordia.study.LoadedCase load(String caseId) {
            CaseData data = generateCase(spec, plan, indexOf(caseId), geometry);
            java.util.TreeMap<org.accordia.study.ReaderId, LabelVolume> byReader = new java.util.TreeMap<>();
            for (int r = 0; r < plan.readers.size(); r++) {
                Reader rd = plan.readers.get(r);
                byReader.put(new org.accordia.study.ReaderId(rd.name, rd.centre), data.masks.get(r));
            }
            return new org.accordia.study.LoadedCase(caseId, geometry, new ArrayList<>(byReader.keySet()),
                new ArrayList<>(byReader.values()));
        }

        /** The centres, in order (the generator's shifted centre is the second one). */
        public List<String> centres() {
            return centreNames(spec.centres());
        }

        /** The reader who draws wider ({@link ExtraPlants#wideReaderCentre()}), or null. */
        public org.accordia.study.ReaderId wideReader() {
            return plan.readers.stream().filter(r -> r.extraMm != 0).findFirst()
                .map(r -> new org.accordia.study.ReaderId(r.name, r.centre)).orElse(null);
        }

        /** The centre whose readers add the local inclusion, or null. */
        public String inclusionCentre() {
            return plan.inclusionCentre >= 0 ? centreNames(spec.centres()).get(plan.inclusionCentre) : null;
        }

        /**
         * The planted shape of one case without any reader: {@code { f(x) < marginMm }} (the truth
         * shape grown by {@code marginMm}; no reader bias, no reader noise), united with the case's
         * local inclusion when {@code withInclusion} and the study has one; the missed-lesion plant
         * does not apply. Full grid, x fastest. {@code marginMm} must lie within the generator's
         * bounding box: |marginMm| at most the largest planted centre or reader margin.
         */
        public boolean[] plantedShape(String caseId, double marginMm, boolean withInclusion) {
            CaseShape sh = shape(spec, plan, indexOf(caseId), geometry, false);
            boolean[] out = new boolean[spec.nx() * spec.ny() * spec.nz()];
            int nxy = spec.nx() * spec.ny();
            int q = 0;
            for (int k = 0; k < sh.bz; k++) {
                for (int j = 0; j < sh.by; j++) {
                    int row = sh.i0[0] + spec.nx() * (sh.i0[1] + j) + nxy * (sh.i0[2] + k);
                    for (int i = 0; i < sh.bx; i++, q++) {
                        double f = Math.min(sh.f1[q], sh.f2[q]);
                        if (withInclusion && sh.fb != null) {
                            f = Math.min(f, sh.fb[q]);
                        }
                        out[row + i] = f < marginMm;
                    }
                }
            }
            return out;
        }

        /** One case's phantom image (generates the case again). */
        public ImageVolume image(String caseId) {
            return generateCase(spec, plan, indexOf(caseId), geometry).image;
        }

        private int indexOf(String caseId) {
            int i = plan.caseIds.indexOf(caseId);
            if (i < 0) {
                throw new IllegalArgumentException("no case " + caseId + " in this demo study");
            }
            return i;
        }
    }

    private static void writeCase(DemoSpec spec, Plan plan, int c, Geometry geometry, Path outDir) throws IOException {
        CaseData data = generateCase(spec, plan, c, geometry);
        String caseId = plan.caseIds.get(c);
        for (int r = 0; r < plan.readers.size(); r++) {
            Reader rd = plan.readers.get(r);
            NiftiWriter.writeLabels(outDir.resolve(rd.centre).resolve(rd.name).resolve(caseId + ".nii.gz"), data.masks.get(r));
        }
        NiftiWriter.writeImage(outDir.resolve("images").resolve(caseId + ".nii.gz"), data.image);
    }

    private static void writeAtomically(Path target, String text) throws IOException {
        Path tmp = target.resolveSibling(target.getFileName() + ".tmp");
        Files.writeString(tmp, text, StandardCharsets.UTF_8);
        try {
            Files.move(tmp, target, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
        } catch (AtomicMoveNotSupportedException e) {
            Files.move(tmp, target, StandardCopyOption.REPLACE_EXISTING);
        }
    }

    // ---------------------------------------------------------------- the plan (who plants what)

    /**
     * @param biasMm the reader's personal margin bias
     * @param extraMm a further margin of the one wide reader ({@link ExtraPlants}), else 0
     */
    record Reader(String centre, String name, int centreIndex, double biasMm, double extraMm) {
    }

    record Plan(List<Reader> readers, List<String> caseIds, int shiftedCentre, int missingReader,
                boolean[] hard, boolean[] missed, boolean[] secondLesion, boolean[] core, DemoTruth truth,
                int inclusionCentre, double inclusionMm) {
    }

    static Plan plan(DemoSpec spec) {
        return plan(spec, ExtraPlants.NONE);
    }

    static Plan plan(DemoSpec spec, ExtraPlants extras) {
        if (!extras.readersByCentre().isEmpty() && extras.readersByCentre().size() != spec.centres()) {
            throw new IllegalArgumentException("the roster names " + extras.readersByCentre().size()
                + " centres but the study has " + spec.centres());
        }
        if (extras.wideReaderCentre() >= spec.centres() || extras.inclusionCentre() >= spec.centres()
            || extras.wideReaderCentre() >= 0 && extras.wideReaderIndex() >= extras.readersAt(spec, extras.wideReaderCentre())) {
            throw new IllegalArgumentException("the wide reader or the inclusion centre is not in the study");
        }
        SplittableRandom rng = new SplittableRandom(mix(spec.seed(), 1));
        List<String> centres = centreNames(spec.centres());
        List<Reader> readers = new ArrayList<>();
        for (int c = 0; c < centres.size(); c++) {
            for (int k = 0; k < extras.readersAt(spec, c); k++) {
                double bias = (rng.nextDouble() * 2 - 1) * spec.readerBiasMm();
                double extra = c == extras.wideReaderCentre() && k == extras.wideReaderIndex() ? extras.wideReaderMm() : 0;
                readers.add(new Reader(centres.get(c), readerName(centres.get(c), k), c, bias, extra));
            }
        }
        List<String> caseIds = new ArrayList<>();
        for (int c = 0; c < spec.cases(); c++) {
            caseIds.add(caseName(c, spec.cases()));
        }
        int shifted = spec.centreShiftMm() != 0 && spec.centres() > 1 ? 1 : -1;
        // the reader who misses the second lesion: at a centre other than the shifted one
        int missCentre = spec.centres() > 1 ? (shifted == 0 ? 1 : 0) : 0;
        int missingReader = -1;
        if (spec.missedLesionCases() > 0) {
            int before = 0;
            for (int c = 0; c < missCentre; c++) {
                before += extras.readersAt(spec, c);
            }
            missingReader = before + rng.nextInt(extras.readersAt(spec, missCentre));
        }

        int n = spec.cases();
        int[] order = permutation(n, rng);
        boolean[] hard = new boolean[n];
        boolean[] missed = new boolean[n];
        boolean[] second = new boolean[n];
        boolean[] core = new boolean[n];
        int pos = 0;
        for (int i = 0; i < spec.hardCases(); i++) {
            hard[order[pos++]] = true;
        }
        int secondCount = Math.max(spec.missedLesionCases(), (n + 1) / 2);
        for (int i = 0; i < secondCount && pos < n; i++) {
            int c = order[pos++];
            second[c] = true;
            if (i < spec.missedLesionCases()) {
                missed[c] = true;
            }
        }
        int[] order2 = permutation(n, rng);
        int coreCount = Math.max(1, (int) Math.round(0.6 * n));
        for (int i = 0; i < coreCount; i++) {
            core[order2[i]] = true;
        }

        List<DemoTruth.CentreInfo> infos = new ArrayList<>();
        Map<String, Double> bias = new LinkedHashMap<>();
        for (int c = 0; c < centres.size(); c++) {
            List<String> names = new ArrayList<>();
            for (Reader r : readers) {
                if (r.centreIndex == c) {
                    names.add(r.name);
                    bias.put(r.centre + "/" + r.name, r.biasMm);
                }
            }
            infos.add(new DemoTruth.CentreInfo(centres.get(c), countryOf(c), names));
        }
        List<String> planted = new ArrayList<>();
        if (shifted >= 0) {
            planted.add(String.format(Locale.ROOT, "the readers of centre %s draw a margin %+.2f mm wider", centres.get(shifted),
                spec.centreShiftMm()));
        }
        if (missingReader >= 0) {
            planted.add("reader " + readers.get(missingReader).centre + "/" + readers.get(missingReader).name
                + " misses the small second lesion in " + spec.missedLesionCases() + " case(s)");
        }
        if (spec.hardCases() > 0) {
            planted.add(spec.hardCases() + " hard case(s) with large disagreement");
        }
        for (Reader r : readers) {
            if (r.extraMm != 0) {
                planted.add(String.format(Locale.ROOT, "reader %s/%s draws a margin %+.2f mm wider than its own bias",
                    r.centre, r.name, r.extraMm));
            }
        }
        int inclusion = extras.inclusionMm() > 0 ? extras.inclusionCentre() : -1;
        if (inclusion >= 0) {
            planted.add(String.format(Locale.ROOT, "the readers of centre %s add a local inclusion reaching %.1f mm"
                + " out on one side of the lesion", centres.get(inclusion), extras.inclusionMm()));
        }
        planted.add("a core (label 2) inside the lesion (label 1) in some cases");
        String scenario = "Fictional lesion-segmentation pilot across " + spec.centres() + " centre(s) in fictional "
            + "countries with " + (extras.readersByCentre().isEmpty() ? String.valueOf(spec.readersPerCentre())
                : extras.readersByCentre().toString()) + " reader(s) each; every reader draws a smooth truth shape "
            + "with a personal margin bias and smooth boundary noise. Planted: " + String.join("; ", planted) + ".";
        DemoTruth truth = new DemoTruth(scenario, spec.seed(), spec, infos,
            shifted >= 0 ? centres.get(shifted) : null, shifted >= 0 ? spec.centreShiftMm() : 0.0,
            missingReader >= 0 ? readers.get(missingReader).centre : null,
            missingReader >= 0 ? readers.get(missingReader).name : null,
            names(caseIds, missed), names(caseIds, hard), names(caseIds, core), names(caseIds, second), bias);
        return new Plan(readers, caseIds, shifted, missingReader, hard, missed, second, core, truth, inclusion,
            inclusion >= 0 ? extras.inclusionMm() : 0);
    }

    private static List<String> names(List<String> caseIds, boolean[] flags) {
        TreeSet<String> out = new TreeSet<>();
        for (int i = 0; i < flags.length; i++) {
            if (flags[i]) {
                out.add(caseIds.get(i));
            }
        }
        return List.copyOf(out);
    }

    private static int[] permutation(int n, SplittableRandom rng) {
        int[] p = new int[n];
        for (int i = 0; i < n; i++) {
            p[i] = i;
        }
        for (int i = n - 1; i > 0; i--) {
            int j = rng.nextInt(i + 1);
            int t = p[i];
            p[i] = p[j];
            p[j] = t;
        }
        return p;
    }

    // ---------------------------------------------------------------- one case

    /** A rotated (about z) ellipsoid; {@link #f} is its signed-distance-like function in mm. */
    static final class Ellipsoid {
        final double cx;
        final double cy;
        final double cz;
        final double a;
        final double b;
        final double c;
        final double cos;
        final double sin;
        final double g;

        Ellipsoid(double cx, double cy, double cz, double a, double b, double c, double cos, double sin) {
            this.cx = cx;
            this.cy = cy;
            this.cz = cz;
            this.a = a;
            this.b = b;
            this.c = c;
            this.cos = cos;
            this.sin = sin;
            this.g = StrictMath.cbrt(a * b * c);
        }

        double g() {
            return g;
        }

        double f(double x, double y, double z) {
            double dx = x - cx;
            double dy = y - cy;
            double u = (dx * cos + dy * sin) / a;
            double v = (-dx * sin + dy * cos) / b;
            double w = (z - cz) / c;
            return (Math.sqrt(u * u + v * v + w * w) - 1) * g;
        }

        /** Half extent along each world axis of {f < margin} (bound on the rotated box). */
        double[] halfExtent(double margin) {
            double s = 1 + Math.max(0, margin) / g;
            double ex = Math.sqrt(a * a * cos * cos + b * b * sin * sin) * s;
            double ey = Math.sqrt(a * a * sin * sin + b * b * cos * cos) * s;
            return new double[] {ex, ey, c * s};
        }
    }

    record CaseData(List<LabelVolume> masks, ImageVolume image) {
    }

    /**
     * The reader-independent part of one case: the box (voxel origin {@code i0}, size bx × by × bz;
     * millimetre corners lo, hi for the smooth fields) and, over the box, the main lesion's shape
     * function f1, the second lesion's f2 (+inf when none) and the local inclusion's fb (null when
     * the study has none), each with the case's deformation.
     */
    record CaseShape(int[] i0, int bx, int by, int bz, double[] lo, double[] hi, float[] f1, float[] f2, float[] fb,
                     boolean hard, boolean core, double coreDepth, double noiseSigma) {
    }

    static CaseShape shape(DemoSpec spec, Plan plan, int caseIndex, Geometry geometry, boolean wholeGrid) {
        SplittableRandom rng = new SplittableRandom(mix(spec.seed(), 2, caseIndex));
        double ex = spec.nx() * spec.sxMm();
        double ey = spec.ny() * spec.syMm();
        double ez = spec.nz() * spec.szMm();
        double size = Math.min(ex, Math.min(ey, ez));
        double angle = rng.nextDouble() * Math.PI;
        Ellipsoid main = new Ellipsoid(
            ex * (0.5 + 0.08 * (rng.nextDouble() * 2 - 1)),
            ey * (0.5 + 0.08 * (rng.nextDouble() * 2 - 1)),
            ez * (0.5 + 0.05 * (rng.nextDouble() * 2 - 1)),
            size * (0.11 + 0.05 * rng.nextDouble()),
            size * (0.09 + 0.05 * rng.nextDouble()),
            size * (0.08 + 0.04 * rng.nextDouble()),
            StrictMath.cos(angle), StrictMath.sin(angle));
        Ellipsoid second = null;
        if (plan.secondLesion[caseIndex]) {
            double r = size * (0.035 + 0.015 * rng.nextDouble());
            double dir = rng.nextDouble() * 2 * Math.PI;
            double dist = Math.max(main.a, main.b) + 2.5 * r + 3;
            second = new Ellipsoid(main.cx + dist * StrictMath.cos(dir), main.cy + dist * StrictMath.sin(dir),
                main.cz, r, r * 0.9, r * 0.8, 1, 0);
        }
        boolean hard = plan.hard[caseIndex];
        boolean core = plan.core[caseIndex];
        double coreDepth = 0.4 * main.g();
        double noiseSigma = hard ? HARD_NOISE_MM : spec.noiseAmplitudeMm();

        // bounding box holding every reader's foreground and the image's lesion contrast
        double deformSigma = 0.08 * main.g();
        double maxThreshold = Math.abs(spec.centreShiftMm()) + spec.readerBiasMm() + (hard ? HARD_BIAS_MM : 0)
            + 2.5 * noiseSigma + 2.5 * deformSigma + 1.0 + plan.readers.stream().mapToDouble(r -> Math.abs(r.extraMm))
            .max().orElse(0);
        double margin = Math.max(maxThreshold, 6.0);
        double[] lo = new double[3];
        double[] hi = new double[3];
        double[] h = main.halfExtent(margin);
        double[] centre = {main.cx, main.cy, main.cz};
        for (int d = 0; d < 3; d++) {
            lo[d] = centre[d] - h[d];
            hi[d] = centre[d] + h[d];
        }
        if (second != null) {
            double[] h2 = second.halfExtent(margin);
            double[] c2 = {second.cx, second.cy, second.cz};
            for (int d = 0; d < 3; d++) {
                lo[d] = Math.min(lo[d], c2[d] - h2[d]);
                hi[d] = Math.max(hi[d], c2[d] + h2[d]);
            }
        }
        // the local inclusion: a ball of radius 2/3 h whose far side lies h out along the lesion's
        // outward normal at a point of its surface in a direction (x-y plane) drawn per case
        double[] ball = null;
        if (plan.inclusionCentre >= 0) {
            double h0 = plan.inclusionMm;
            double phi = new SplittableRandom(mix(spec.seed(), 7, caseIndex)).nextDouble() * 2 * Math.PI;
            double dx = StrictMath.cos(phi);
            double dy = StrictMath.sin(phi);
            double rho = main.f(main.cx + dx, main.cy + dy, main.cz) / main.g() + 1;
            double px = main.cx + dx / rho;
            double py = main.cy + dy / rho;
            double u = ((px - main.cx) * main.cos + (py - main.cy) * main.sin) / main.a;
            double v = (-(px - main.cx) * main.sin + (py - main.cy) * main.cos) / main.b;
            double nx = u / main.a * main.cos - v / main.b * main.sin;
            double ny = u / main.a * main.sin + v / main.b * main.cos;
            double nn = Math.hypot(nx, ny);
            double radius = 2.0 / 3.0 * h0;
            ball = new double[] {px + (h0 - radius) * nx / nn, py + (h0 - radius) * ny / nn, main.cz, radius};
            for (int d = 0; d < 3; d++) {
                lo[d] = Math.min(lo[d], ball[d] - radius - margin);
                hi[d] = Math.max(hi[d], ball[d] + radius + margin);
            }
        }
        double[] sp = {spec.sxMm(), spec.syMm(), spec.szMm()};
        int[] dims = {spec.nx(), spec.ny(), spec.nz()};
        int[] i0 = new int[3];
        int[] i1 = new int[3];
        for (int d = 0; d < 3; d++) {
            i0[d] = Math.max(0, (int) Math.floor(lo[d] / sp[d]));
            i1[d] = Math.min(dims[d] - 1, (int) Math.ceil(hi[d] / sp[d]));
        }
        if (wholeGrid) {
            for (int d = 0; d < 3; d++) {
                i0[d] = 0;
                i1[d] = dims[d] - 1;
            }
        }
        int bx = Math.max(0, i1[0] - i0[0] + 1);
        int by = Math.max(0, i1[1] - i0[1] + 1);
        int bz = Math.max(0, i1[2] - i0[2] + 1);
        int boxVoxels = bx * by * bz;
        SmoothField deform = new SmoothField(lo, hi, Math.max(0.6 * main.g(), 4.0), deformSigma,
            new SplittableRandom(mix(spec.seed(), 3, caseIndex)));
        float[] f1 = new float[boxVoxels];
        float[] f2 = new float[boxVoxels];
        float[] fb = ball == null ? null : new float[boxVoxels];
        int q = 0;
        for (int k = 0; k < bz; k++) {
            double z = (i0[2] + k) * sp[2];
            for (int j = 0; j < by; j++) {
                double y = (i0[1] + j) * sp[1];
                for (int i = 0; i < bx; i++, q++) {
                    double x = (i0[0] + i) * sp[0];
                    double d = deform.value(x, y, z);
                    f1[q] = (float) (main.f(x, y, z) + d);
                    f2[q] = second == null ? Float.POSITIVE_INFINITY : (float) (second.f(x, y, z) + d);
                    if (fb != null) {
                        double ux = x - ball[0];
                        double uy = y - ball[1];
                        double uz = z - ball[2];
                        fb[q] = (float) (Math.sqrt(ux * ux + uy * uy + uz * uz) - ball[3] + d);
                    }
                }
            }
        }

        return new CaseShape(i0, bx, by, bz, lo, hi, f1, f2, fb, hard, core, coreDepth, noiseSigma);
    }

    static CaseData generateCase(DemoSpec spec, Plan plan, int caseIndex, Geometry geometry) {
        return generateCase(spec, plan, caseIndex, geometry, false);
    }

    /**
     * One case's masks and image. {@code wholeGrid} evaluates the shape on every voxel instead of
     * the bounding box only: the slow oracle the tests compare the fast path against.
     */
    static CaseData generateCase(DemoSpec spec, Plan plan, int caseIndex, Geometry geometry, boolean wholeGrid) {
        CaseShape sh = shape(spec, plan, caseIndex, geometry, wholeGrid);
        int bx = sh.bx;
        int by = sh.by;
        int bz = sh.bz;
        int[] i0 = sh.i0;
        double[] sp = {spec.sxMm(), spec.syMm(), spec.szMm()};
        int nxy = spec.nx() * spec.ny();
        List<LabelVolume> masks = new ArrayList<>();
        SplittableRandom caseReaderRng = new SplittableRandom(mix(spec.seed(), 4, caseIndex));
        for (int r = 0; r < plan.readers.size(); r++) {
            Reader rd = plan.readers.get(r);
            double caseBias = sh.hard ? (caseReaderRng.nextDouble() * 2 - 1) * HARD_BIAS_MM : 0;
            double base = rd.biasMm + caseBias + (rd.centreIndex == plan.shiftedCentre ? spec.centreShiftMm() : 0)
                + rd.extraMm;
            SmoothField noise = new SmoothField(sh.lo, sh.hi, 6.0, sh.noiseSigma,
                new SplittableRandom(mix(spec.seed(), 5, caseIndex, r)));
            boolean misses = r == plan.missingReader && plan.missed[caseIndex];
            float[] fb = rd.centreIndex == plan.inclusionCentre ? sh.fb : null;
            byte[] labels = new byte[geometry.nx() * geometry.ny() * geometry.nz()];
            int q = 0;
            for (int k = 0; k < bz; k++) {
                double z = (i0[2] + k) * sp[2];
                for (int j = 0; j < by; j++) {
                    double y = (i0[1] + j) * sp[1];
                    int row = (i0[0]) + spec.nx() * (i0[1] + j) + nxy * (i0[2] + k);
                    for (int i = 0; i < bx; i++, q++) {
                        double fa = sh.f1[q];
                        double fo = misses ? Double.POSITIVE_INFINITY : sh.f2[q];
                        if (fb != null) {
                            fo = Math.min(fo, fb[q]);
                        }
                        double fmin = Math.min(fa, fo);
                        if (fmin > base + noise.bound()) {
                            continue;
                        }
                        double x = (i0[0] + i) * sp[0];
                        double t = base + noise.value(x, y, z);
                        if (fmin < t) {
                            labels[row + i] = (byte) (sh.core && fa + sh.coreDepth < t ? 2 : 1);
                        }
                    }
                }
            }
            masks.add(LabelVolume.ofBytes(geometry, labels));
        }

        ImageVolume image = phantom(spec, geometry, caseIndex, i0, bx, by, bz, sh.f1, sh.f2, sh.core, sh.coreDepth);
        return new CaseData(masks, image);
    }

    /** Smooth tissue-like intensities with a brighter lesion (integers stored as float32). */
    private static ImageVolume phantom(DemoSpec spec, Geometry g, int caseIndex, int[] i0, int bx, int by, int bz,
                                       float[] f1, float[] f2, boolean core, double coreDepth) {
        double ex = spec.nx() * spec.sxMm();
        double ey = spec.ny() * spec.syMm();
        double ez = spec.nz() * spec.szMm();
        SmoothField texture = new SmoothField(new double[] {0, 0, 0}, new double[] {ex, ey, ez}, 12.0, 6.0,
            new SplittableRandom(mix(spec.seed(), 6, caseIndex)));
        double rx = 0.46 * ex;
        double ry = 0.40 * ey;
        double rmin = Math.min(rx, ry);
        int nx = spec.nx();
        int ny = spec.ny();
        int nz = spec.nz();
        float[] data = new float[nx * ny * nz];
        double[] body = new double[nx * ny];
        for (int j = 0; j < ny; j++) {
            for (int i = 0; i < nx; i++) {
                double u = (i * spec.sxMm() - ex / 2) / rx;
                double v = (j * spec.syMm() - ey / 2) / ry;
                double bf = (Math.sqrt(u * u + v * v) - 1) * rmin;
                body[i + nx * j] = logistic(-bf / 2.0);
            }
        }
        double[] tex = new double[nx];
        for (int k = 0; k < nz; k++) {
            double z = k * spec.szMm();
            for (int j = 0; j < ny; j++) {
                double y = j * spec.syMm();
                texture.row(0, spec.sxMm(), nx, y, z, tex);
                for (int i = 0; i < nx; i++) {
                    double w = body[i + nx * j];
                    double value = 12 + w * (88 + tex[i]);
                    int li = i - i0[0];
                    int lj = j - i0[1];
                    int lk = k - i0[2];
                    if (li >= 0 && lj >= 0 && lk >= 0 && li < bx && lj < by && lk < bz) {
                        int q = li + bx * (lj + by * lk);
                        double f = Math.min(f1[q], f2[q]);
                        value += 45 * logistic(-f / 0.6);
                        if (core) {
                            value += 25 * logistic(-(f1[q] + coreDepth) / 0.6);
                        }
                    }
                    data[i + nx * (j + ny * k)] = (float) Math.rint(value);
                }
            }
        }
        return new ImageVolume(g, data);
    }

    private static double logistic(double t) {
        if (t < -40) {
            return 0;
        }
        if (t > 40) {
            return 1;
        }
        return 1 / (1 + StrictMath.exp(-t));
    }
}
