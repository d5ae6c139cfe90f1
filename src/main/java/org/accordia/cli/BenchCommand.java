package org.accordia.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.time.Instant;
import java.time.temporal.ChronoUnit;
import java.util.Locale;
import java.util.concurrent.Callable;
import java.util.List;
import org.accordia.bench.AnalyzeBench;
import org.accordia.bench.AnalyzeProbe;
import org.accordia.bench.BenchNumbers;
import org.accordia.bench.BenchStudies;
import org.accordia.bench.CaseBench;
import org.accordia.bench.ChildJvm;
import org.accordia.bench.Machine;
import org.accordia.demo.DemoSpec;
import org.accordia.io.InputException;
import org.accordia.study.LoadOptions;
import org.accordia.study.Study;
import org.accordia.study.StudyLoader;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/**
 * {@code accordia bench}: measures the agreement, consensus and end-to-end steps against the time
 * the same JVM needs to read and inflate the masks, and prints the ratios beside their targets
 * (docs/benchmarks.md).
 */
@Command(
    name = "bench",
    mixinStandardHelpOptions = true,
    versionProvider = VersionProvider.class,
    description = {
        "Times the analysis steps as ratios to the time needed to read the masks.",
        "Measures the analysis steps on a generated study (cached in the work folder) and prints "
            + "each step's time as a ratio to the time the same JVM needs to read and inflate the masks, "
            + "with the targets. Medians over rounds after a warm-up; the machine and its load average "
            + "are printed."
    })
public final class BenchCommand implements Callable<Integer> {

    /** What to measure. */
    enum What { agreement, consensus, analyze, memory, all }

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Option(names = "--what", paramLabel = "PART",
        description = "agreement, consensus, analyze (end to end and memory), memory (the memory part alone) or all"
            + " (default: ${DEFAULT-VALUE}).")
    What what = What.all;

    @Option(names = "--cases", paramLabel = "N",
        description = "Cases of the generated study (default: ${DEFAULT-VALUE}).")
    int cases = 20;

    @Option(names = "--size", paramLabel = "X,Y,Z", split = ",",
        description = "Grid size in voxels (default: 256,256,128).")
    int[] size = {256, 256, 128};

    @Option(names = "--spacing", paramLabel = "X,Y,Z", split = ",",
        description = "Voxel spacing in millimetres (default: 0.7,0.7,1.5).")
    double[] spacing = {0.7, 0.7, 1.5};

    @Option(names = "--threads", paramLabel = "N",
        description = "Threads for reading, agreement and the pipeline (default: the processors, ${DEFAULT-VALUE}).")
    int threads = Runtime.getRuntime().availableProcessors();

    @Option(names = "--work", paramLabel = "DIR",
        description = "Folder where generated studies are cached and reused (default: ${DEFAULT-VALUE}).")
    Path work = Path.of(System.getProperty("java.io.tmpdir"), "accordia-bench");

    @Option(names = "--rounds", paramLabel = "N",
        description = "Measured rounds; each time printed is the median over them (default: ${DEFAULT-VALUE}).")
    int rounds = 5;

    @Option(names = "--warmup", paramLabel = "N",
        description = "Rounds run first and discarded (default: ${DEFAULT-VALUE}).")
    int warmup = 1;

    @Option(names = "--analyze-cases", paramLabel = "N",
        description = "Cases of the study timed end to end (default: ${DEFAULT-VALUE}).")
    int analyzeCases = 20;

    @Option(names = "--analyze-rounds", paramLabel = "N",
        description = "Measured end-to-end rounds (after --warmup discarded ones) (default: ${DEFAULT-VALUE}).")
    int analyzeRounds = 3;

    @Option(names = "--memory-cases", paramLabel = "A,B", split = ",",
        description = "Case counts of the two studies whose peak memory is compared (default: 20,80).")
    int[] memoryCases = {20, 80};

    @Option(names = "--child-xmx", paramLabel = "SIZE",
        description = "Maximum heap of each child JVM of the memory comparison (default: ${DEFAULT-VALUE}).")
    String childXmx = "384m";

    @Override
    public Integer call() throws Exception {
        if (size.length != 3 || spacing.length != 3) {
            throw new CommandLine.ParameterException(spec.commandLine(), "--size and --spacing need three values X,Y,Z");
        }
        if (memoryCases.length != 2 || memoryCases[0] < 1 || memoryCases[1] < 1) {
            throw new CommandLine.ParameterException(spec.commandLine(), "--memory-cases needs two positive counts A,B");
        }
        if (!childXmx.matches("[0-9]+[kKmMgG]?")) {
            throw new CommandLine.ParameterException(spec.commandLine(), "--child-xmx must look like 1536m or 2g");
        }
        ThreadCount.check(spec.commandLine(), threads);
        if (rounds < 1 || warmup < 0 || cases < 1 || analyzeCases < 1 || analyzeRounds < 1) {
            throw new CommandLine.ParameterException(spec.commandLine(),
                "--threads, --rounds and --cases must be at least 1, --warmup at least 0");
        }
        PrintWriter w = spec.commandLine().getOut();
        Machine machine = Machine.now();
        w.printf(Locale.ROOT, "accordia bench, %s%n", Instant.now().truncatedTo(ChronoUnit.SECONDS));
        w.printf(Locale.ROOT, "machine: %s (at start; the machine may be shared)%n", machine.describe());
        w.flush();
        DemoSpec demo;
        try {
            demo = BenchStudies.spec(cases, size, spacing);
        } catch (IllegalArgumentException e) {
            throw new CommandLine.ParameterException(spec.commandLine(), e.getMessage());
        }
        if (what == What.agreement || what == What.consensus || what == What.all) {
            Path folder = prepare(w, demo);
            Study study = StudyLoader.load(folder, LoadOptions.DEFAULT);
            CaseBench.Result r = CaseBench.run(study, threads, warmup, rounds, what != What.agreement);
            printCases(w, r, what != What.consensus, what != What.agreement);
        }
        if (what == What.analyze || what == What.all) {
            w.println();
            analyze(w);
        }
        if (what == What.analyze || what == What.all || what == What.memory) {
            w.println();
            memory(w);
        }
        w.flush();
        return ExitCodes.OK;
    }

    void analyze(PrintWriter w) throws Exception {
        DemoSpec demo = BenchStudies.spec(analyzeCases, size, spacing);
        Path folder = prepare(w, demo);
        Study study = StudyLoader.load(folder, LoadOptions.DEFAULT);
        w.printf(Locale.ROOT, "end to end: load average now %s; threads %d; %d warm-up round(s), median of %d%n",
            Machine.loadNow(), threads, warmup, analyzeRounds);
        w.println("  analyze = library pipeline (StudyAnalysis) with real outputs into a temporary folder: "
            + AnalyzeBench.OUTPUTS);
        w.println("  read = every mask of the study read and inflated through the real readers, same threads");
        w.flush();
        AnalyzeBench.Result a = AnalyzeBench.run(study, BenchStudies.protocol(), threads, warmup, analyzeRounds);
        w.printf(Locale.ROOT, "  %d cases, %d masks: analyze %.1f s, read %.1f s (medians)%n", a.cases(), a.masks(),
            a.analyzeNs() / 1e9, a.readNs() / 1e9);
        w.println("  rounds: " + a.perRound());
        w.printf(Locale.ROOT, "%-66s %7.2fx %9s %s%n", "end-to-end analyze / read", a.ratio(), "<= 3.0x",
            verdict(a.ratio() <= 3.0, threads));
        w.flush();
    }

    void memory(PrintWriter w) throws Exception {
        w.printf(Locale.ROOT, "peak memory: each study analysed end to end in a child JVM with -Xmx%s, %d threads%n",
            childXmx, threads);
        long[] peak = new long[2];
        long[] ms = new long[2];
        for (int i = 0; i < 2; i++) {
            Path f = prepare(w, BenchStudies.spec(memoryCases[i], size, spacing));
            ChildJvm.Outcome o = ChildJvm.run(childXmx, AnalyzeProbe.class, List.of(f.toString(),
                Integer.toString(threads)));
            if (o.exitCode() != 0) {
                throw new IllegalStateException("child JVM failed (exit " + o.exitCode() + "): " + o.stderr().strip());
            }
            peak[i] = o.number("VMHWM_KIB");
            ms[i] = o.number("ELAPSED_MS");
            w.printf(Locale.ROOT, "  child JVM -Xmx%s, %d cases: analyze %.1f s, peak resident memory (VmHWM) %.0f MiB;"
                    + " heap: peak used %.0f MiB, peak committed %.0f MiB, live after a full GC with the result"
                    + " reachable %.0f MiB%n", childXmx, memoryCases[i], ms[i] / 1e3, peak[i] / 1024.0,
                o.number("HEAP_PEAK_USED_KIB") / 1024.0, o.number("HEAP_PEAK_COMMITTED_KIB") / 1024.0,
                o.number("LIVE_HEAP_AFTER_KIB") / 1024.0);
            w.flush();
        }
        if (peak[0] > 0 && peak[1] > 0) {
            double ratio = (double) peak[1] / peak[0];
            w.printf(Locale.ROOT, "%-66s %7.2fx %9s %s%n", String.format(Locale.ROOT,
                "peak resident memory, %d cases / %d cases", memoryCases[1], memoryCases[0]), ratio, "within 20%",
                Math.abs(ratio - 1) <= 0.20 ? "yes" : "NO");
        } else {
            w.println("peak resident memory: not available on this system (no /proc/self/status)");
        }
    }

    Path prepare(PrintWriter w, DemoSpec demo) throws java.io.IOException, InputException {
        boolean cached = BenchStudies.isCached(work.resolve(BenchStudies.folderNameOf(demo)), demo);
        long t0 = System.nanoTime();
        Path folder = BenchStudies.ensure(demo, work, threads);
        w.printf(Locale.ROOT, "study: %s (%s), %d cases x %d readers (%d centres x %d), %dx%dx%d voxels, %sx%sx%s mm%n",
            folder, cached ? "cached" : String.format(Locale.ROOT, "generated in %.1f s", (System.nanoTime() - t0) / 1e9),
            demo.cases(), demo.centres() * demo.readersPerCentre(), demo.centres(), demo.readersPerCentre(), demo.nx(),
            demo.ny(), demo.nz(), BenchNumbers.text(demo.sxMm()), BenchNumbers.text(demo.syMm()), BenchNumbers.text(demo.szMm()));
        w.flush();
        return folder;
    }

    static void printCases(PrintWriter w, CaseBench.Result r, boolean agreement, boolean consensus) {
        int readers = r.total().readers();
        int pairs = readers * (readers - 1) / 2;
        w.printf(Locale.ROOT, "structures: %s; %d readers, %d pairs; threads %d; %d warm-up round(s) discarded,"
            + " median of %d round(s)%n", String.join(", ", r.structures()), readers, pairs, r.threads(), r.warmups(),
            r.rounds());
        w.printf(Locale.ROOT, "lesion size: median largest extent of the readers' union box %.1f mm%n",
            r.total().lesionExtentMm());
        w.println("read = every mask of the case read and inflated through the real readers on the same threads;"
            + " read1 = the same on one thread");
        StringBuilder head = new StringBuilder(String.format(Locale.ROOT, "%-10s %9s %9s", "case", "read ms", "read1 ms"));
        if (agreement) {
            head.append(String.format(Locale.ROOT, " %12s %7s", "agreement ms", "ratio"));
        }
        if (consensus) {
            head.append(String.format(Locale.ROOT, " %12s %7s %12s %7s", "cons-hist ms", "ratio", "cons-voxel ms",
                "ratio"));
        }
        w.println(head);
        for (CaseBench.CaseTimes c : r.cases()) {
            w.println(row(c, agreement, consensus));
        }
        w.println(row(r.total(), agreement, consensus));
        w.println();
        w.printf(Locale.ROOT, "%-66s %8s %9s %s%n", "ratio (total, medians)", "measured", "target", "met");
        CaseBench.CaseTimes t = r.total();
        if (agreement) {
            double ratio = t.agreementNs() / t.readNs();
            w.printf(Locale.ROOT, "%-66s %7.2fx %9s %s%n",
                "agreement: " + pairs + " pairs x " + r.structures().size() + " structures / read", ratio,
                "<= 1.0x", verdict(ratio <= 1.0, r.threads()));
        }
        if (consensus) {
            double ratio = t.consensusHistogramNs() / t.readNs();
            w.printf(Locale.ROOT, "%-66s %7.2fx %9s %s%n",
                "consensus, histogram parts (STAPLE + leave-one-out + per-centre) / read", ratio, "<= 0.2x",
                verdict(ratio <= 0.2, r.threads()));
            double voxel = t.consensusVoxelNs() / t.readNs();
            w.printf(Locale.ROOT, "%-66s %7.2fx %9s %s%n",
                "consensus, voxel parts (surfaces, map, masks; one thread) / read", voxel, "none", "(reported only)");
        }
    }

    static String verdict(boolean met, int threads) {
        return (met ? "yes" : "NO") + (threads == 2 ? "" : " (target is stated for 2 threads)");
    }

    private static String row(CaseBench.CaseTimes c, boolean agreement, boolean consensus) {
        StringBuilder s = new StringBuilder(String.format(Locale.ROOT, "%-10s %9.1f %9.1f", c.caseId(), c.readNs() / 1e6,
            c.read1Ns() / 1e6));
        if (agreement) {
            s.append(String.format(Locale.ROOT, " %12.1f %6.2fx", c.agreementNs() / 1e6, c.agreementNs() / c.readNs()));
        }
        if (consensus) {
            s.append(String.format(Locale.ROOT, " %12.2f %6.3fx %12.1f %6.2fx", c.consensusHistogramNs() / 1e6,
                c.consensusHistogramNs() / c.readNs(), c.consensusVoxelNs() / 1e6, c.consensusVoxelNs() / c.readNs()));
        }
        return s.toString();
    }
}
