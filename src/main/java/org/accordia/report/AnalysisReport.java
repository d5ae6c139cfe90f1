package org.accordia.report;

import java.io.IOException;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.accordia.agreement.PairMetrics;
import org.accordia.analysis.CaseRecord;
import org.accordia.analysis.FlaggedEvent;
import org.accordia.analysis.InputChecksums;
import org.accordia.analysis.LabelResult;
import org.accordia.analysis.MissedStructure;
import org.accordia.analysis.StructureCase;
import org.accordia.analysis.StudyResult;
import org.accordia.consensus.ReaderPerformance;
import org.accordia.consensus.ReaderSummary;
import org.accordia.consensus.StapleOptions;
import org.accordia.consensus.StapleResult;
import org.accordia.shift.CaseToAdjudicate;
import org.accordia.shift.CentreContrasts;
import org.accordia.shift.GroupEffect;
import org.accordia.shift.ReaderToRecalibrate;
import org.accordia.shift.ShiftSettings;
import org.accordia.shift.VarianceComponents;
import org.accordia.shift.Verdict;
import org.accordia.shift.VerdictRules;
import org.accordia.study.ReaderId;

/**
 * Writes every study-level output of a run into the output folder: the CSV tables
 * ({@link Tables}), {@code summary.json} ({@link SummaryJson}) and {@code report.html}: the
 * decision per label with its rule and evidence, what to do next (cases to adjudicate, readers to
 * recalibrate, centres to discuss), the charts, the pictures of the most contentious cases, the
 * flagged events, the methods with the settings and input checksums, and the cautions.
 * The consensus volumes are written per case by {@link ConsensusFiles}.
 */
public final class AnalysisReport {
    /** Pictures in the report. */
    public static final int PICTURES = 3;
    /** Most flagged events listed in the HTML (all are in events.csv). */
    static final int MAX_EVENTS_SHOWN = 60;
    private static final int WIDTH = 760;

    private AnalysisReport() {
    }

    /**
     * What the run knows beyond the result.
     *
     * @param version the tool's version
     * @param inputs checksums of every input file
     * @param protocolSource where the protocol came from, in words (e.g. "protocol.yaml in the study")
     * @param protocol where the protocol came from, as summary.json records it
     * @param run the details of the run for the report's Run section, or {@code null}
     */
    public record RunInfo(String version, List<InputChecksums.InputFile> inputs, String protocolSource,
                          SummaryJson.ProtocolInfo protocol, Run run) {
        public RunInfo {
            inputs = List.copyOf(inputs);
        }

        /** A run whose protocol was supplied by the calling program (no details of the run). */
        public RunInfo(String version, List<InputChecksums.InputFile> inputs, String protocolSource) {
            this(version, inputs, protocolSource, new SummaryJson.ProtocolInfo("supplied", null));
        }

        /** Without the details of the run (a run made in memory, e.g. a benchmark). */
        public RunInfo(String version, List<InputChecksums.InputFile> inputs, String protocolSource,
                       SummaryJson.ProtocolInfo protocol) {
            this(version, inputs, protocolSource, protocol, null);
        }

        /** The same, with the details of the run (shown in the report's Run section). */
        public RunInfo withRun(Run details) {
            return new RunInfo(version, inputs, protocolSource, protocol, details);
        }
    }

    /**
     * How the report was made, for audits and ethics files (shown in the report's "Run" section;
     * not in the CSV tables or summary.json, which stay byte-identical between runs).
     *
     * @param startedUtc when the run started, ISO-8601 in UTC (e.g. {@code 2026-12-02T15:31:13Z})
     * @param commandLine the command as typed, e.g. {@code accordia analyze demo-masks --out r}
     *     ({@link #commandLine(String, List)} from the program name and all its arguments), or
     *     {@code null} when the analysis was started by a program
     * @param inputRoot the study folder (absolute)
     * @param protocol the protocol file as listed among the inputs with its SHA-256, or {@code null}
     *     when the built-in defaults were used
     */
    public record Run(String startedUtc, String commandLine, String inputRoot, InputChecksums.InputFile protocol) {
        /** A command line from its words, each quoted for a POSIX shell when it needs to be. */
        public static String commandLine(String command, List<String> args) {
            StringBuilder sb = new StringBuilder(command);
            for (String a : args) {
                sb.append(' ').append(a.matches("[A-Za-z0-9_./:=@%+,-]+") ? a : "'" + a.replace("'", "'\\''") + "'");
            }
            return sb.toString();
        }

        /** The time in whole seconds, ISO-8601 UTC. */
        public static String utc(java.time.Instant t) {
            return java.time.format.DateTimeFormatter.ISO_INSTANT.format(t.truncatedTo(java.time.temporal.ChronoUnit.SECONDS));
        }
    }

    /** Writes the tables, summary.json and report.html. */
    public static void write(OutputFolder out, StudyResult r, List<ConsensusFiles.Picture> pictures,
            RunInfo info) throws IOException {
        write(out, r, pictures, info, 1);
    }

    /**
     * As {@link #write(OutputFolder, StudyResult, List, RunInfo)}; with {@code threads}
     * ≥ 2 the HTML report (charts, pictures) is made on a second thread while this one writes the
     * tables and the summary. The files are the same either way.
     */
    public static void write(OutputFolder out, StudyResult r, List<ConsensusFiles.Picture> pictures,
            RunInfo info, int threads) throws IOException {
        if (threads < 2) {
            writeTables(out, r, info);
            out.writeString(OutputFolder.REPORT_HTML, html(r, pictures, info));
            return;
        }
        java.util.concurrent.ExecutorService helper = java.util.concurrent.Executors.newSingleThreadExecutor(t -> {
            Thread th = new Thread(t, "accordia-report");
            th.setDaemon(true);
            return th;
        });
        try {
            java.util.concurrent.Future<String> html = helper.submit(() -> html(r, pictures, info));
            writeTables(out, r, info);
            String page = null;
            try {
                page = html.get();
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                throw new IllegalStateException("report interrupted", e);
            } catch (java.util.concurrent.ExecutionException e) {
                org.accordia.analysis.Failures.rethrowUnchecked(e.getCause());
            }
            out.writeString(OutputFolder.REPORT_HTML, page);
        } finally {
            helper.shutdownNow();
        }
    }

    private static void writeTables(OutputFolder out, StudyResult r, RunInfo info) throws IOException {
        out.writeAtomically("pairs.csv", Tables.pairs(r)::write);
        out.writeAtomically("readers.csv", Tables.readers(r)::write);
        out.writeAtomically("centres.csv", Tables.centres(r)::write);
        out.writeAtomically("cases.csv", Tables.cases(r)::write);
        out.writeAtomically("reader_summary.csv", Tables.readerSummary(r)::write);
        out.writeAtomically("events.csv", Tables.events(r)::write);
        out.writeAtomically(OutputFolder.SUMMARY_JSON, o -> JsonOutput.write(SummaryJson.of(r, info.version(), info.protocol(), info.inputs()), o));
    }

    /** The HTML report. */
    public static String html(StudyResult r, List<ConsensusFiles.Picture> pictures, RunInfo info) {
        String study = r.protocol().study() == null ? "Study" : r.protocol().study();
        HtmlReport h = new HtmlReport(study + ": agreement, consensus and annotation shift")
            .subtitle(String.format(Locale.ROOT, "%d cases · %d readers · %d centres · %d structure%s (%s)",
                r.cases().size(), r.readers().size(), r.centres().size(), r.structures().size(),
                r.structures().size() == 1 ? "" : "s",
                String.join(", ", r.structures().stream().map(s -> s.name()).toList())))
            .generatedBy("Accordia " + info.version());
        decision(h, r);
        nextSteps(h, r);
        charts(h, r);
        pictures(h, r, pictures);
        events(h, r);
        methods(h, r, info);
        run(h, info);
        for (String c : SummaryJson.CAUTIONS) {
            h.caution(c);
        }
        return h.toHtml();
    }

    // ------------------------------------------------------------------ decision

    static HtmlReport.Level level(Verdict v) {
        return switch (v) {
            case POOL -> HtmlReport.Level.POOL;
            case REVIEW -> HtmlReport.Level.REVIEW;
            case RE_ANNOTATE -> HtmlReport.Level.REANNOTATE;
        };
    }

    static String verdictWords(Verdict v) {
        return switch (v) {
            case POOL -> "pool: the masks can be pooled";
            case REVIEW -> "review before pooling";
            case RE_ANNOTATE -> "re-annotate (or harmonise) before pooling";
        };
    }

    private static void decision(HtmlReport h, StudyResult r) {
        h.section("Decision");
        h.paragraph("One decision per structure, with the rule that fired first and its evidence. "
            + "Rules are checked in a fixed order (see Methods); every rule that fired is listed.");
        for (LabelResult l : r.labels()) {
            var s = l.summary();
            String first = s.reasons().isEmpty() ? "" : s.reasons().get(0);
            String headline = DecisionWords.headline(s.rule());
            h.callout(level(s.verdict()), l.name() + " — " + (headline != null ? headline : verdictWords(s.verdict())),
                "Rule: " + s.rule() + ". " + first);
            List<String> items = new ArrayList<>();
            for (org.accordia.shift.DesignLimit d : s.designLimitations()) {
                items.add(DecisionWords.design(d, r.shiftSettings().alpha()));
            }
            for (int i = 1; i < s.reasons().size(); i++) {
                items.add(s.reasons().get(i));
            }
            if (!l.centreNotes().isEmpty()) {
                items.add("On the centres' opposite effects: see Centres to discuss.");
            }
            if (!items.isEmpty()) {
                h.list(items);
            }
            List<org.accordia.shift.LocalEffect> local = l.shift().localEffects();
            if (LocalPicture.worthShowing(local, org.accordia.shift.LocalEffects.MINIMUM_EXCESS)) {
                h.figure(LocalPicture.chart(local, l.name(), WIDTH, 420), l.name() + ": where on the structure the "
                    + "centres differ. Bars: share of each centre's border more than the structure's tolerance outside "
                    + "the other centres' consensus, per direction from the consensus centre.",
                    "Bar chart of the share of border beyond tolerance per centre and direction for " + l.name());
            }
        }
    }

    // ------------------------------------------------------------------ what to do next

    private static void nextSteps(HtmlReport h, StudyResult r) {
        h.section("What to do next");
        h.subsection("Cases to adjudicate");
        List<List<String>> rows = new ArrayList<>();
        for (LabelResult l : r.labels()) {
            for (CaseToAdjudicate c : l.summary().casesToAdjudicate()) {
                rows.add(List.of(l.name(), c.caseId(), String.join("; ", c.reasons())));
            }
        }
        if (rows.isEmpty()) {
            h.paragraph("No case needs adjudication: the readers do not genuinely disagree on any case (masks a "
                + "reader should correct are listed below).");
        } else {
            h.paragraph("Cases the readers genuinely disagree on, judged without the masks listed under Masks to "
                + "correct.");
            h.table(null, List.of("Structure", "Case", "Why"), rows, null);
        }

        h.subsection("Masks to correct");
        rows = new ArrayList<>();
        for (LabelResult l : r.labels()) {
            for (org.accordia.shift.MaskToCorrect m : l.summary().masksToCorrect()) {
                rows.add(List.of(l.name(), m.caseId(), capitalise(DecisionWords.correction(m)) + "."));
            }
        }
        if (rows.isEmpty()) {
            h.paragraph("No reader leaves out a part that the others mark.");
        } else {
            h.paragraph("One reader's slip on one case: a part most readers mark is left out, or the mask is empty "
                + "while every other reader draws the structure. These go back to the reader, not to adjudication, "
                + "and do not count toward the adjudication share.");
            h.table(null, List.of("Structure", "Case", "What to correct"), rows, null);
        }

        h.subsection("Readers to recalibrate");
        rows = new ArrayList<>();
        for (LabelResult l : r.labels()) {
            for (MissedStructure m : l.missedStructure()) {
                List<String> parts = new ArrayList<>();
                for (int i = 0; i < m.cases().size(); i++) {
                    parts.add(String.format(Locale.ROOT, "%s (%s ml; sensitivity %s vs the others' median %s)",
                        m.cases().get(i), two(m.partsMl().get(i)),
                        two(m.sensitivities().get(i)), two(m.othersMedian().get(i))));
                }
                rows.add(List.of(l.name(), m.reader(), m.centre(),
                    "Leaves out a whole part of " + l.name() + " that most readers mark (e.g. a small second lesion), in "
                        + m.cases().size() + " case" + (m.cases().size() == 1 ? "" : "s") + ": " + String.join(", ", parts)
                        + "."));
            }
            for (ReaderToRecalibrate rr : l.summary().readersToRecalibrate()) {
                rows.add(List.of(l.name(), rr.reader(), rr.centre(), capitalise(String.join("; ", rr.reasons())) + "."));
            }
        }
        if (rows.isEmpty()) {
            h.paragraph("No reader departs systematically from the others.");
        } else {
            h.paragraph("Readers who leave out whole parts of a structure come first; then readers whose margin or "
                + "volume departs from the other readers' consensus by more than the tolerance over the whole "
                + "interval. A reader at a shifted centre is listed here too when the centre's shift is large: "
                + "discuss the centre first.");
            h.table(null, List.of("Structure", "Reader", "Centre", "Why"), rows, null);
        }

        h.subsection("Centres to discuss");
        rows = new ArrayList<>();
        for (LabelResult l : r.labels()) {
            List<GroupEffect> effects = new ArrayList<>(CentreContrasts.effects(l.shift().centreContrasts()));
            effects.sort(Comparator.comparingDouble((GroupEffect e) -> Double.isNaN(e.signedSurfaceMm())
                ? 0 : -Math.abs(e.signedSurfaceMm())).thenComparing(GroupEffect::group));
            Map<String, String> flags = flagsOf(l);
            for (GroupEffect e : effects) {
                String flag = flags.getOrDefault(e.group(), VerdictRules.FLAG_NONE);
                if (flag.equals(VerdictRules.FLAG_NONE)) {
                    continue;
                }
                rows.add(List.of(l.name(), e.group(), flag, capitalise(e.describe("the other centres")) + "."));
            }
        }
        if (rows.isEmpty()) {
            h.paragraph("No centre's effect reaches the minimum shift.");
        } else {
            h.paragraph("Largest effect first. Each centre's effect is its readers' mean signed surface distance to "
                + "a common reference (the consensus of all readers) minus the mean of the other centres' (95% "
                + "intervals with readers and cases both random in brackets); positive distances mean the centre "
                + "draws outside (wider), negative inside. A centre is flagged only when its own test against the "
                + "other centres' readers rejects (Holm-adjusted across centres) and its interval passes the "
                + "minimum.");
            h.table(null, List.of("Structure", "Centre", "Flag", "Effect"), rows, null);
            for (LabelResult l : r.labels()) {
                for (String n : l.centreNotes()) {
                    h.paragraph(l.name() + ": " + n);
                }
            }
        }
    }

    private static Map<String, String> flagsOf(LabelResult l) {
        Map<String, String> m = new java.util.TreeMap<>();
        l.shift().centreRows().forEach(c -> m.put(c.centre(), c.flag()));
        return m;
    }

    // ------------------------------------------------------------------ charts

    private static void charts(HtmlReport h, StudyResult r) {
        ShiftSettings s = r.shiftSettings();
        List<String> names = r.readers().stream().map(ReaderId::reader).toList();
        List<String> centres = r.readers().stream().map(ReaderId::centre).toList();
        h.section("Agreement between readers");
        List<double[][]> matrices = new ArrayList<>();
        for (LabelResult l : r.labels()) {
            matrices.add(meanDice(r, l.index() - 1));
        }
        double scaleLower = Charts.colourScaleLower(matrices); // one colour, one value, in every structure's map
        Map<String, List<String>> absent = Absence.absentCases(r);
        for (LabelResult l : r.labels()) {
            double[][] m = matrices.get(l.index() - 1);
            int absentHere = absent.get(l.name()).size();
            h.figure(Charts.agreementMatrix(names, centres, m, scaleLower, "Mean pairwise Dice, " + l.name(), WIDTH, 620),
                String.format(Locale.ROOT, "Mean Dice over the cases in which both readers have a mask and at least "
                    + "one reader drew %s%s, readers grouped by centre. A block pattern (higher agreement within "
                    + "centres) points to centre conventions. Every structure's map uses the same colour scale, "
                    + "from %s to 1.", l.name(), absentHere == 0 ? ""
                    : " (" + absentHere + " case" + (absentHere == 1 ? "" : "s") + " where no reader drew it left out)",
                    Numbers.format(scaleLower)),
                "Reader by reader matrix of mean Dice for " + l.name());
        }
        h.section("Centre effects");
        for (LabelResult l : r.labels()) {
            List<GroupEffect> e = CentreContrasts.effects(l.shift().centreContrasts());
            if (e.size() < 2) {
                // one centre (or none comparable): no centre has other centres to be compared with
                h.paragraph("No centre effect for " + l.name() + ": a centre is compared with the other centres' "
                    + "consensus, and this study has fewer than two centres with readers.");
                continue;
            }
            List<String> g = e.stream().map(GroupEffect::group).toList();
            h.figure(Charts.intervalPlot(g, e.stream().mapToDouble(GroupEffect::signedSurfaceMm).toArray(),
                    e.stream().mapToDouble(GroupEffect::signedSurfaceLoMm).toArray(),
                    e.stream().mapToDouble(GroupEffect::signedSurfaceHiMm).toArray(),
                    "Centre effect: signed surface distance minus the other centres' (mm)", 0, s.minimumShiftMm(),
                    "95% intervals, readers and cases random (model-based)", "Centre margin, " + l.name(), WIDTH,
                    120 + 50 * g.size()),
                String.format(Locale.ROOT, "Each centre's mean border offset to a common reference (the consensus of "
                    + "all readers) minus the mean of the other centres', with 95%% intervals that count readers and "
                    + "cases as random; positive = wider. When one centre draws wider, the others show its mirror "
                    + "(about −Δ/(G−1)); the flag rests on each centre's own test. Shaded: ±%s mm, the smallest "
                    + "shift that matters.", Numbers.format(s.minimumShiftMm())),
                "Forest plot of centre margin shifts for " + l.name());
            h.figure(Charts.intervalPlot(g, e.stream().mapToDouble(GroupEffect::volumeRatio).toArray(),
                    e.stream().mapToDouble(GroupEffect::volumeRatioLo).toArray(),
                    e.stream().mapToDouble(GroupEffect::volumeRatioHi).toArray(),
                    "Centre volume effect: ratio to the other centres' (1 = same)", 1, s.minimumVolumeShiftPercent() / 100,
                    "95% intervals, readers and cases random (model-based)", "Centre volume, " + l.name(), WIDTH,
                    120 + 50 * g.size()),
                String.format(Locale.ROOT, "Geometric-mean volume ratio of each centre's readers to the common "
                    + "reference divided by the other centres' (the same contrast on the log scale), with 95%% "
                    + "intervals. Shaded: ±%s%%, the smallest volume shift that matters.",
                    Numbers.format(s.minimumVolumeShiftPercent())),
                "Forest plot of centre volume ratios for " + l.name());
        }
        h.section("Readers");
        for (LabelResult l : r.labels()) {
            List<ReaderSummary> rs = l.readerSummaries().stream()
                .filter(x -> x.reference().equals(ReaderPerformance.REFERENCE_OTHERS)).toList();
            if (rs.isEmpty()) {
                continue;
            }
            h.figure(Charts.scatter(rs.stream().map(ReaderSummary::reader).toList(),
                    rs.stream().map(ReaderSummary::centre).toList(),
                    rs.stream().mapToDouble(ReaderSummary::meanSpecificity).toArray(),
                    rs.stream().mapToDouble(ReaderSummary::meanSensitivity).toArray(),
                    "Specificity (within the STAPLE region)", "Sensitivity", true, "Readers against the others' consensus, "
                        + l.name(), WIDTH, 520),
                "Each reader's mean sensitivity and specificity against the STAPLE consensus of the other readers "
                    + "(leave-one-reader-out), over cases; specificity counts voxels within the STAPLE region ("
                    + r.stapleRegion() + ").",
                "Scatter of reader sensitivity against specificity for " + l.name());
            List<List<String>> rows = new ArrayList<>();
            for (ReaderSummary x : rs) {
                rows.add(List.of(x.reader(), x.centre(), Integer.toString(x.cases()),
                    withInterval(x.meanSensitivity(), x.sensitivityLo(), x.sensitivityHi()),
                    withInterval(x.meanDice(), x.diceLo(), x.diceHi()),
                    withInterval(x.meanSignedSurfaceMm(), x.signedSurfaceLoMm(), x.signedSurfaceHiMm()),
                    withInterval(x.geoMeanVolumeRatio(), x.volumeRatioLo(), x.volumeRatioHi())));
            }
            int absentHere = absent.get(l.name()).size();
            h.table("Readers against the other readers' consensus, " + l.name() + " (mean [95% interval]; cases: "
                    + "those in which some reader drew " + l.name()
                    + (absentHere == 0 ? "" : ", " + absentHere + " where none did left out") + ")",
                List.of("Reader", "Centre", "Cases", "Sensitivity", "Dice", "Signed surface (mm)", "Volume ratio"),
                rows, new boolean[] {false, false, true, true, true, true, true});
        }
        h.section("Where the disagreement lies");
        List<String> cats = new ArrayList<>();
        List<double[]> vals = new ArrayList<>();
        // the case component is left out: every reader is measured against a consensus of the same case, so
        // whatever the case shares with all its readers cancels and that component is about 0 by construction
        List<String> comps = List.of(VarianceComponents.CENTRE, VarianceComponents.READER, VarianceComponents.RESIDUAL);
        for (LabelResult l : r.labels()) {
            VarianceComponents.Result vc = l.shift().varianceComponents();
            if (vc == null) {
                continue;
            }
            double[] v = new double[comps.size()];
            for (int k = 0; k < comps.size(); k++) {
                String name = comps.get(k);
                v[k] = vc.components().stream().filter(c -> c.name().equals(name))
                    .mapToDouble(VarianceComponents.Component::estimate).findFirst().orElse(Double.NaN);
            }
            cats.add(l.name());
            vals.add(v);
        }
        if (!cats.isEmpty()) {
            h.figure(Charts.stackedShares(cats, List.of("centre", "reader within centre", "residual"),
                    vals.toArray(new double[0][]), "Variance components of the signed surface distance", WIDTH,
                    110 + 60 * cats.size()),
                "Shares of the variance of each reader's signed surface distance (against the consensus of all "
                    + "readers of the case) taken by centres, readers within centres and the rest (REML fit). A large "
                    + "centre share means the centres draw differently. The case component is not shown: each reader "
                    + "is measured against a consensus of the same case, so what a case shares with all its readers "
                    + "cancels and that component is about 0 by construction (it stays in summary.json).",
                "Stacked bars of variance components per structure");
        }
        List<List<String>> iccRows = new ArrayList<>();
        for (LabelResult l : r.labels()) {
            for (var f : l.summary().icc()) {
                iccRows.add(List.of(l.name(), f.form(), f.value() == null ? "" : withInterval(f.value(),
                    f.lower() == null ? Double.NaN : f.lower(), f.upper() == null ? Double.NaN : f.upper()),
                    iccQuestion(f.form())));
            }
        }
        if (iccRows.isEmpty()) {
            h.paragraph("No ICC of volumes: fewer than two cases were read by every reader.");
        } else {
            h.table("Side table: ICC of the readers' volumes (Shrout & Fleiss forms, complete cases only)",
                List.of("Structure", "Form", "ICC [95% interval]", "Question it answers"), iccRows,
                new boolean[] {false, false, true, false});
            h.paragraph("Shrout & Fleiss (1979): form 1 treats each case's readers as a random draw (one-way), form "
                + "2 the readers as a random sample of readers (two-way, absolute agreement), form 3 these readers "
                + "as the only ones of interest (two-way, consistency); \"1\" is about one reader's volume, \"k\" "
                + "about the mean of all k readers. Whether another reader like these would draw the same volume "
                + "is ICC(2,1).");
        }
        for (LabelResult l : r.labels()) {
            List<String> cases = new ArrayList<>();
            List<String> states = new ArrayList<>();
            double[] v = new double[r.cases().size()];
            int k = 0;
            for (CaseRecord c : r.cases()) {
                StructureCase sc = c.structures().get(l.index() - 1);
                cases.add(c.caseId());
                states.add(sc.state());
                v[k++] = 1 - sc.agreement().medianDice();
            }
            h.figure(Charts.rankedBars(cases, v, states, 1 - s.adjudicationDice(), "1 − median pairwise Dice",
                    "Cases ranked by disagreement, " + l.name(), WIDTH, 380),
                String.format(Locale.ROOT, "Cases above the line (median pairwise Dice below %s) go to adjudication; "
                    + "a case can also go there for a large HD95 or an empty mask (see the table above).%s%s",
                    Numbers.format(s.adjudicationDice()),
                    states.contains(StructureCase.PARTLY_DRAWN) ? " Hatched bars: some readers drew no " + l.name()
                        + " in that case (their pairs count with Dice 0)." : "",
                    states.contains(StructureCase.ABSENT) ? " Cases where no reader drew " + l.name()
                        + " have no bar: they are marked absent, which is not agreement." : ""),
                "Bar chart of cases ranked by disagreement for " + l.name());
        }
    }

    /**
     * Mean pairwise Dice of every reader pair over the cases where both have a mask and some reader
     * drew the structure (NaN when none).
     */
    static double[][] meanDice(StudyResult r, int s) {
        int n = r.readers().size();
        double[][] sum = new double[n][n];
        int[][] count = new int[n][n];
        Map<String, Integer> index = new java.util.HashMap<>();
        for (int i = 0; i < n; i++) {
            index.put(r.readers().get(i).label(), i);
        }
        for (CaseRecord c : r.cases()) {
            if (c.structures().get(s).absent()) {
                continue; // no reader drew it: two empty masks' Dice of 1 is a convention, not agreement
            }
            for (PairMetrics p : c.structures().get(s).agreement().pairs()) {
                int a = index.get(p.centreA() + "/" + p.readerA());
                int b = index.get(p.centreB() + "/" + p.readerB());
                sum[a][b] += p.dice();
                sum[b][a] += p.dice();
                count[a][b]++;
                count[b][a]++;
            }
        }
        double[][] m = new double[n][n];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                m[i][j] = i == j ? 1 : count[i][j] == 0 ? Double.NaN : sum[i][j] / count[i][j];
            }
        }
        return m;
    }

    // ------------------------------------------------------------------ pictures

    private static void pictures(HtmlReport h, StudyResult r, List<ConsensusFiles.Picture> pictures) {
        h.section("The most contentious cases");
        if (pictures.isEmpty()) {
            h.paragraph("No picture: no case has two readers with a non-empty mask.");
            return;
        }
        h.paragraph("For the cases with the lowest median pairwise Dice: the slice of constant z with the most voxels "
            + "marked by some readers but not all, every reader's contour drawn over the case's image (or, when "
            + "the study has no image, over the STAPLE probability map). Colours tell readers apart, line styles "
            + "centres (legend in each picture). Slices are shown in array order; the letters at the edges give "
            + "the anatomical directions from the image's affine (R/L right-left, A/P anterior-posterior, S/I "
            + "superior-inferior).");
        int shown = 0;
        for (ConsensusFiles.Picture p : pictures) {
            if (shown++ >= PICTURES) {
                break;
            }
            var g = p.geometry();
            var box = p.box();
            float[] background = p.image() != null ? p.image() : p.probability();
            String over = p.image() != null ? "the case's image" : "the STAPLE probability map";
            List<Overlays.Contour> contours = new ArrayList<>();
            for (int j = 0; j < p.readers().size(); j++) {
                contours.add(new Overlays.Contour(p.readers().get(j).reader(), p.readers().get(j).centre(),
                    p.masks().get(j)));
            }
            byte[] png = Overlays.render(background, box.nx(), box.ny(), g.spacing(0), g.spacing(1), contours,
                p.caseId() + " · " + p.structure() + " · " + Overlays.planeName(g) + " slice z = " + p.z(),
                Overlays.edgeLabels(g));
            h.figure(png, String.format(Locale.ROOT, "%s, %s: slice z = %d with %d disputed voxels, over %s; "
                    + "median pairwise Dice %s.", p.caseId(), p.structure(), p.z(), p.disputedVoxels(), over,
                    two(1 - p.score())),
                "Reader contours on the most disputed slice of " + p.caseId());
        }
    }

    // ------------------------------------------------------------------ events

    private static void events(HtmlReport h, StudyResult r) {
        h.section("Flagged events");
        List<FlaggedEvent> all = Absence.events(r);
        List<FlaggedEvent> events = all.stream().filter(e -> !e.kind().equals(FlaggedEvent.ABSENT)).toList();
        List<String> absentLines = new ArrayList<>();
        Absence.absentCases(r).forEach((structure, cases) -> {
            if (!cases.isEmpty()) {
                absentLines.add(String.format(Locale.ROOT, "%s: absent in %d of %d cases (no reader drew it): %s.",
                    structure, cases.size(), r.cases().size(), String.join(", ", cases)));
            }
        });
        if (all.isEmpty()) {
            h.paragraph("No missing mask, no empty mask and no undefined distance.");
            return;
        }
        if (!absentLines.isEmpty()) {
            h.paragraph("Structures absent from a case, one line per structure (one \"absent\" row per case in "
                + "events.csv). Absent is not agreement: these cases are left out of the agreement summaries, the "
                + "reader tables and the heat maps, and have no bar among the ranked cases.");
            h.list(absentLines);
        }
        if (events.isEmpty()) {
            h.paragraph("No other event: no missing mask, no empty mask beside the absences, no undefined distance.");
            return;
        }
        Map<String, Integer> byKind = new java.util.TreeMap<>();
        events.forEach(e -> byKind.merge(e.kind(), 1, Integer::sum));
        List<String> counts = new ArrayList<>();
        byKind.forEach((k, v) -> counts.add(v + " × " + k));
        h.paragraph("Shown, never dropped: " + String.join(", ", counts) + ". An empty mask gives Dice 1 with "
            + "another empty mask and 0 with a non-empty one; its surface distances are undefined and left out "
            + "of the distance summaries, and counted here. All events are in events.csv.");
        List<List<String>> rows = new ArrayList<>();
        for (FlaggedEvent e : events) {
            if (rows.size() >= MAX_EVENTS_SHOWN) {
                break;
            }
            rows.add(List.of(e.caseId(), e.label(), e.reader(), e.kind(), e.detail()));
        }
        h.table(events.size() > MAX_EVENTS_SHOWN ? "First " + MAX_EVENTS_SHOWN + " of " + events.size()
            + " events (all in events.csv)" : null, List.of("Case", "Structure", "Reader", "Kind", "Detail"), rows, null);
    }

    // ------------------------------------------------------------------ methods

    /** The STAPLE prior and convergence rule in words, from the options the run used. */
    static String stapleWords(StapleOptions o) {
        String prior = o.priorIsFixed() ? "fixed at " + Numbers.format(o.fixedPrior())
            : "the mean foreground fraction over readers and voxels of the region";
        int exponent = (int) Math.round(Math.log10(o.tolerance()));
        String tolerance = o.tolerance() > 0 && Math.pow(10, exponent) == o.tolerance() ? "1e" + exponent
            : Numbers.format(o.tolerance());
        return "prior = " + prior + "; converged when no parameter changes by more than " + tolerance + " (at most "
            + String.format(Locale.ROOT, "%,d", o.maxIterations()) + " iterations)";
    }

    private static void methods(HtmlReport h, StudyResult r, RunInfo info) {
        ShiftSettings s = r.shiftSettings();
        h.section("Methods");
        h.paragraph("How every number above was computed (overlap, surfaces, consensus, centre differences, "
            + "the decision rules), the settings used and the references.");
        h.details("Methods, settings and references (click to open)");
        h.paragraph("Overlap. Dice = 2|A∩B| / (|A|+|B|) (Dice 1945); Jaccard = |A∩B| / |A∪B| (Jaccard 1912); "
            + "volumes in ml from voxel counts and the voxel spacing. Two empty masks: Dice 1, distances undefined; "
            + "one empty: Dice 0, distances undefined (both flagged).");
        h.paragraph("Surfaces. Border voxels are foreground voxels with at least one face-neighbour in background "
            + "(6-connectivity in 3-D, 4 in 2-D; outside the grid counts as background). Distances are Euclidean, "
            + "in mm, between voxel centres, with the voxel spacing, from an exact distance transform "
            + "(Felzenszwalb & Huttenlocher 2012). HD is the largest directed distance; HD95 the larger of the "
            + "two directed 95th percentiles (linear interpolation between order statistics, Hyndman & Fan type 7)"
            + (r.settings().agreement().hd95() == org.accordia.study.Protocol.Hd95Mode.POOLED
                ? "; this run uses the pooled variant, the 95th percentile of both directed sets together" : "")
            + "; ASSD the mean of both directed sets; NSD the share of border voxels within τ of the other border "
            + "(Nikolov et al. 2021), τ per structure. Signed surface distance: mean over a reader's border "
            + "voxels of the distance to the consensus border, positive outside.");
        h.paragraph("Fleiss' kappa (Fleiss 1971) over the union of all readers' structure grown by τ, so that the "
            + "background far from the structure does not inflate it.");
        h.paragraph("Consensus. Binary STAPLE (Warfield, Zou & Wells 2004) per structure on the decision-pattern "
            + "histogram: W starts as the fraction of readers marking the voxel and the M-step runs first; "
            + stapleWords(r.settings().consensus().staple()) + "; region: "
            + r.stapleRegion() + "; consensus = voxels with W ≥ " + Numbers.format(StapleResult.CONSENSUS_THRESHOLD)
            + ". References per reader: all readers; "
            + "all other readers (leave-one-reader-out); readers of the other centres (leave-one-centre-out, used "
            + "for centre effects). Multi-label STAPLE (Warfield et al. 2004; Rohlfing et al. 2004) for the label "
            + "masks" + (r.multiLabelUndecided() >= 0 ? "; voxels it cannot decide (exact ties) carry the value "
            + r.multiLabelUndecided() : "") + ". A reader who leaves out a whole component of the majority-vote "
            + "consensus in a case is listed as missing part of the structure.");
        h.paragraph(String.format(Locale.ROOT, "Centre differences. Distance-based partition of the reader-pair "
            + "distances (%s) into within- and between-centre parts (PERMANOVA, Anderson 2001), tested by "
            + "permuting the readers' centre labels (the same assignment for every case; exact enumeration of distinct "
            + "partitions up to %d, else %d Monte Carlo permutations); α = %s. Centre and reader effects: mean "
            + "signed surface distance and geometric-mean volume ratio with %d-resample case-bootstrap "
            + "percentile intervals (Efron & Tibshirani 1993). Variance components: REML fit of case, centre, "
            + "reader-within-centre and residual variance of the signed surface distance (Patterson & Thompson "
            + "1971), intervals by parametric bootstrap. ICC of volumes on complete cases (Shrout & Fleiss 1979). "
            + "Centre effects against a common reference (the consensus of all readers), with intervals from the "
            + "variance components (readers and cases random). A centre is flagged only when its own "
            + "centre-vs-rest permutation test rejects (Holm's step-down across centres, a rejected centre leaving "
            + "the rest; Holm 1979) AND its interval lies entirely beyond the minimum shift (%s mm or %s%% volume).", r.labels().isEmpty() ? "" : r.labels().get(0).input().distanceName(),
            s.exactLimit(), s.permutations(), Numbers.format(s.alpha()), s.bootstrapResamples(),
            Numbers.format(s.minimumShiftMm()), Numbers.format(s.minimumVolumeShiftPercent())));
        h.paragraph("Decision rules, in order: empty-centre or empty-reader (review; no pooling verdict while a "
            + "group's masks are all empty for a structure the others draw); centre-shift or centre-pair-differs "
            + "(re-annotate; a centre is flagged on its surface or volume interval, or on the share of its border "
            + "beyond the structure's tolerance, against the typical centre); significant-but-small, "
            + "uncertain-centre-effect, design-cannot-reach-alpha, many-cases-to-adjudicate (cases the readers "
            + "genuinely disagree on; masks a reader should correct are listed apart), readers-to-recalibrate "
            + "(review); otherwise single-centre (one centre: shift not testable) or no-shift (pool). Every random generator is seeded from the seed below; the "
            + "same inputs and seed give the same tables and summary whatever the number of threads.");
        h.subsection("Settings used");
        h.paragraph("Protocol: " + info.protocolSource() + ".");
        List<Map.Entry<String, String>> settings = new ArrayList<>();
        SummaryJson.settings(r.settings()).forEach((k, v) -> settings.add(Map.entry(k,
            v instanceof Double d ? Numbers.format(d) : String.valueOf(v))));
        settings.add(Map.entry("structures", String.join("; ", r.structures().stream()
            .map(x -> x.name() + " = labels " + x.labels() + ", τ " + Numbers.format(x.toleranceMm()) + " mm").toList())));
        settings.add(Map.entry("software", "Accordia " + info.version()));
        h.definitionList(settings);
        h.subsection("References");
        h.list(List.of(
            "Anderson MJ (2001). A new method for non-parametric multivariate analysis of variance. Austral Ecology 26:32–46.",
            "Dice LR (1945). Measures of the amount of ecologic association between species. Ecology 26:297–302.",
            "Efron B, Tibshirani RJ (1993). An Introduction to the Bootstrap. Chapman & Hall.",
            "Felzenszwalb PF, Huttenlocher DP (2012). Distance transforms of sampled functions. Theory of Computing 8:415–428.",
            "Fleiss JL (1971). Measuring nominal scale agreement among many raters. Psychological Bulletin 76:378–382.",
            "Hyndman RJ, Fan Y (1996). Sample quantiles in statistical packages. The American Statistician 50:361–365.",
            "Jaccard P (1912). The distribution of the flora in the alpine zone. New Phytologist 11:37–50.",
            "Nikolov S et al. (2021). Clinically applicable segmentation of head and neck anatomy for radiotherapy. J Med Internet Res 23:e26151.",
            "Patterson HD, Thompson R (1971). Recovery of inter-block information when block sizes are unequal. Biometrika 58:545–554.",
            "Rohlfing T, Russakoff DB, Maurer CR (2004). Performance-based classifier combination in atlas-based image segmentation. IEEE TMI 23:983–994.",
            "Shrout PE, Fleiss JL (1979). Intraclass correlations: uses in assessing rater reliability. Psychological Bulletin 86:420–428.",
            "Warfield SK, Zou KH, Wells WM (2004). Simultaneous truth and performance level estimation (STAPLE). IEEE TMI 23:903–921."));
        h.endDetails();
    }

    // ------------------------------------------------------------------ run

    private static void run(HtmlReport h, RunInfo info) {
        h.section("Run");
        List<Map.Entry<String, String>> rows = new ArrayList<>();
        Run run = info.run();
        if (run != null) {
            rows.add(Map.entry("Started (UTC)", run.startedUtc()));
            if (run.commandLine() != null) {
                rows.add(Map.entry("Command", run.commandLine()));
            }
            rows.add(Map.entry("Study folder", run.inputRoot()));
        }
        rows.add(Map.entry("Protocol", info.protocolSource()));
        if (run != null && run.protocol() != null) {
            rows.add(Map.entry("Protocol file", run.protocol().path()));
            rows.add(Map.entry("Protocol SHA-256", run.protocol().sha256()));
        }
        rows.add(Map.entry("Software", "Accordia " + info.version()));
        long bytes = info.inputs().stream().mapToLong(InputChecksums.InputFile::bytes).sum();
        rows.add(Map.entry("Inputs", info.inputs().isEmpty() ? "none (cases generated in memory)"
            : info.inputs().size() + " files, " + bytes + " bytes; SHA-256 of each below"));
        h.definitionList(rows);
        if (!info.inputs().isEmpty()) {
            h.details("SHA-256 of the " + info.inputs().size() + " input files (click to open)");
            List<List<String>> files = new ArrayList<>();
            for (InputChecksums.InputFile f : info.inputs()) {
                files.add(List.of(f.path(), Long.toString(f.bytes()), f.sha256()));
            }
            h.styledTable(null, List.of("File", "Bytes", "SHA-256"), files, new String[] {"mono", "num", "mono"});
            h.endDetails();
        }
    }

    // ------------------------------------------------------------------ helpers

    /** Which question an ICC form answers (Shrout &amp; Fleiss 1979; McGraw &amp; Wong 1996), in one sentence. */
    static String iccQuestion(String form) {
        String f = form.replace(" ", "");
        boolean single = f.endsWith(",1)");
        String who = single ? "one reader's volume" : "the mean volume of all the readers";
        if (f.startsWith("ICC(1,")) {
            return "How reliable is " + who + " when readers are not told apart (one-way; reader differences count "
                + "as error)?";
        }
        if (f.startsWith("ICC(2,")) {
            return "Would other readers like these give the same " + (single ? "volume" : "mean volume")
                + " (absolute agreement; a reader who draws larger lowers it)?";
        }
        if (f.startsWith("ICC(3,")) {
            return "Do these readers rank and space the cases alike (consistency; a reader who draws uniformly "
                + "larger does not lower it)?" + (single ? "" : " For the mean of all the readers.");
        }
        return "";
    }

    private static String two(double v) {
        return Double.isFinite(v) ? String.format(Locale.ROOT, "%.2f", v) : "n/a";
    }

    private static String withInterval(double est, double lo, double hi) {
        if (!Double.isFinite(est)) {
            return "";
        }
        return String.format(Locale.ROOT, "%.2f", est)
            + (Double.isFinite(lo) && Double.isFinite(hi)
            ? String.format(Locale.ROOT, " [%.2f, %.2f]", lo, hi) : "");
    }

    private static String capitalise(String s) {
        return s.isEmpty() ? s : Character.toUpperCase(s.charAt(0)) + s.substring(1);
    }

    /** The structures' cases in record order for a label (tests). */
    static List<StructureCase> structureCases(StudyResult r, int s) {
        return r.cases().stream().map(c -> c.structures().get(s)).toList();
    }
}
