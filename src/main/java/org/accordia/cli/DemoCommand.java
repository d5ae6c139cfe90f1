package org.accordia.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.Locale;
import java.util.concurrent.Callable;
import org.accordia.demo.DemoGenerator;
import org.accordia.demo.DemoSpec;
import org.accordia.demo.DemoTruth;
import org.accordia.io.InputException;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/** {@code accordia demo}: writes the synthetic demo study (scenario in docs/demo.md). */
@Command(
    name = "demo",
    mixinStandardHelpOptions = true,
    versionProvider = VersionProvider.class,
    description = {
        "Writes a synthetic multi-centre study (invented scenario, no patient data).",
        "Masks in the folder layout <out>/<centre>/<reader>/<case>.nii.gz, a phantom image per case in "
            + "<out>/images, protocol.yaml (the study's structures and settings, read by analyze), "
            + "manifest.csv and demo-truth.json (what was planted where)."
    })
public final class DemoCommand implements Callable<Integer> {

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Option(names = "--out", required = true, paramLabel = "DIR",
        description = "Output folder; must not exist or be empty.")
    Path out;

    @Option(names = "--seed", paramLabel = "N",
        description = "Seed of every random choice; the same seed gives byte-identical files (default: ${DEFAULT-VALUE}).")
    long seed = DemoSpec.DEFAULT_SEED;

    @Option(names = "--cases", paramLabel = "N", description = "Number of cases, 1..999 (default: ${DEFAULT-VALUE}).")
    int cases = DemoSpec.defaults().cases();

    @Option(names = "--centres", paramLabel = "N", description = "Number of centres, 1..26 (default: ${DEFAULT-VALUE}).")
    int centres = DemoSpec.defaults().centres();

    @Option(names = "--readers-per-centre", paramLabel = "N",
        description = "Readers at each centre, 1..26 (default: ${DEFAULT-VALUE}).")
    int readersPerCentre = DemoSpec.defaults().readersPerCentre();

    @Option(names = "--size", paramLabel = "X,Y,Z", split = ",",
        description = "Grid size in voxels (default: 96,96,48).")
    int[] size = {96, 96, 48};

    @Option(names = "--spacing", paramLabel = "X,Y,Z", split = ",",
        description = "Voxel spacing in millimetres (default: 0.8,0.8,2.5).")
    double[] spacing = {0.8, 0.8, 2.5};

    @Option(names = "--centre-shift", paramLabel = "MM",
        description = "Margin shift of the shifted centre in mm; 0 plants no shift (default: ${DEFAULT-VALUE}).")
    double centreShiftMm = DemoSpec.defaults().centreShiftMm();

    @Option(names = "--threads", paramLabel = "N",
        description = "Cases generated in parallel; the files do not depend on it (default: ${DEFAULT-VALUE}).")
    int threads = Math.max(1, Math.min(4, Runtime.getRuntime().availableProcessors()));

    @Override
    public Integer call() throws Exception {
        if (size.length != 3) {
            throw new CommandLine.ParameterException(spec.commandLine(), "--size needs three values X,Y,Z");
        }
        if (spacing.length != 3) {
            throw new CommandLine.ParameterException(spec.commandLine(), "--spacing needs three values X,Y,Z");
        }
        ThreadCount.check(spec.commandLine(), threads);
        DemoSpec d;
        try {
            DemoSpec base = DemoSpec.defaults().withSeed(seed).withRoster(cases, centres, readersPerCentre)
                .withGrid(size[0], size[1], size[2], spacing[0], spacing[1], spacing[2]);
            d = base.withPlants(centreShiftMm, base.missedLesionCases(), base.hardCases());
        } catch (IllegalArgumentException e) {
            throw new CommandLine.ParameterException(spec.commandLine(), e.getMessage());
        }
        long t0 = System.nanoTime();
        DemoTruth truth;
        try {
            truth = DemoGenerator.generate(d, out, threads);
        } catch (java.io.IOException e) {
            throw new InputException(out, "cannot write: " + e.getMessage(), e);
        }
        double seconds = (System.nanoTime() - t0) / 1e9;
        PrintWriter w = spec.commandLine().getOut();
        w.printf(Locale.ROOT, "Wrote %d cases x %d readers (%d centres) to %s in %.1f s%n",
            d.cases(), d.centres() * d.readersPerCentre(), d.centres(), out, seconds);
        if (truth.shiftedCentre() != null) {
            w.printf(Locale.ROOT, "Planted: centre %s draws a margin %+.1f mm wider%n", truth.shiftedCentre(), truth.centreShiftMm());
        }
        if (truth.missingLesionReader() != null) {
            w.printf(Locale.ROOT, "Planted: reader %s/%s misses the second lesion in %s%n", truth.missingLesionCentre(),
                truth.missingLesionReader(), String.join(", ", truth.missedLesionCases()));
        }
        if (!truth.hardCases().isEmpty()) {
            w.printf(Locale.ROOT, "Planted: hard cases %s%n", String.join(", ", truth.hardCases()));
        }
        w.printf(Locale.ROOT, "Details: %s%n", out.resolve(DemoTruth.FILE_NAME));
        w.flush();
        return ExitCodes.OK;
    }
}
