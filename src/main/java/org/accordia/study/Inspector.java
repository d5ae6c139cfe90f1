package org.accordia.study;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.SortedMap;
import java.util.SortedSet;
import java.util.TreeMap;
import java.util.TreeSet;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import org.accordia.io.Geometry;
import org.accordia.io.InputException;
import org.accordia.io.LabelVolume;
import org.accordia.io.ReadLimits;
import org.accordia.io.Volumes;

/**
 * Checks a study without analysing it: reads every mask once (case by case, in parallel over
 * cases, one mask per worker in memory at a time), checks each case's grids, counts the labels
 * seen, and collects every problem instead of stopping at the first.
 *
 * <p>Errors (the study is not analysable, {@link Analysability}): an unreadable mask or image, a
 * grid mismatch within a case, no case, fewer than two readers, no mask holding a voxel of a
 * structure analysed. Warnings: a case with fewer than two readers, a single
 * centre, protocol labels never seen, labels seen that no structure covers. Notes: a centre with a
 * single reader (its within-centre disagreement is not estimable), files ignored by discovery.
 */
public final class Inspector {
    private Inspector() {
    }

    /**
     * Inspects a study.
     *
     * @param threads worker threads (at least 1); cases are spread over them
     */
    public static InspectionReport inspect(Study study, Protocol protocol, ReadLimits limits, int threads) {
        List<StudyProblem> problems = new ArrayList<>(study.problems());
        List<CaseResult> results = new ArrayList<>();
        int workers = Math.max(1, Math.min(threads, Math.max(1, study.cases().size())));
        ExecutorService pool = Executors.newFixedThreadPool(workers, r -> {
            Thread t = new Thread(r, "accordia-inspect");
            t.setDaemon(true);
            return t;
        });
        try {
            List<Future<CaseResult>> futures = new ArrayList<>();
            for (String c : study.cases()) {
                futures.add(pool.submit(() -> inspectCase(study, c, protocol, limits)));
            }
            for (Future<CaseResult> f : futures) {
                results.add(f.get());
            }
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException("inspection interrupted", e);
        } catch (ExecutionException e) {
            Throwable cause = e.getCause();
            if (cause instanceof RuntimeException re) {
                throw re;
            }
            if (cause instanceof Error err) {
                throw err;
            }
            throw new IllegalStateException(cause);
        } finally {
            pool.shutdownNow();
        }

        SortedMap<Integer, Long> labels = new TreeMap<>();
        List<InspectionReport.CaseSummary> cases = new ArrayList<>();
        for (CaseResult r : results) {
            cases.add(r.summary);
            problems.addAll(r.problems);
            r.summary.labelVoxels().forEach((k, v) -> labels.merge(k, v, Long::sum));
        }

        Path where = Analysability.where(study);
        if (study.cases().isEmpty()) {
            problems.add(Analysability.noCase(study));
        }
        StudyProblem tooFewReaders = Analysability.tooFewReaders(study);
        if (tooFewReaders != null) {
            problems.add(tooFewReaders);
        }
        if (study.centres().size() == 1) {
            problems.add(StudyProblem.warning(where, "a single centre ('" + study.centres().get(0)
                + "'): the between-centre shift is not estimable"));
        }
        for (String centre : study.centres()) {
            List<ReaderId> rs = study.readersOf(centre);
            if (rs.size() == 1) {
                problems.add(StudyProblem.note(where, "centre '" + centre + "' has a single reader ("
                    + rs.get(0).reader() + "): within-centre disagreement is not estimable for it"));
            }
        }
        for (InspectionReport.CaseSummary c : cases) {
            if (c.readers().size() < 2 && study.readers().size() >= 2) {
                problems.add(StudyProblem.warning(where, "case '" + c.caseId() + "' has " + c.readers().size()
                    + " reader(s): it is left out of pairwise agreement"));
            }
        }
        SortedSet<Integer> seen = new TreeSet<>(labels.keySet());
        List<Structure> structures = protocol.structuresFor(seen);
        if (protocol.hasExplicitStructures()) {
            for (Structure s : structures) {
                for (int v : s.labels()) {
                    if (!seen.contains(v) && !study.cases().isEmpty()) {
                        problems.add(StudyProblem.warning(null, "structure '" + s.name() + "': label " + v
                            + " is never seen in any readable mask"));
                    }
                }
            }
            for (Map.Entry<Integer, Long> e : labels.entrySet()) {
                boolean covered = structures.stream().anyMatch(s -> s.covers(e.getKey()));
                if (!covered) {
                    problems.add(StudyProblem.warning(null, "label " + e.getKey() + " is seen (" + e.getValue()
                        + " voxels) but no structure of the protocol covers it: it is ignored"));
                }
            }
        }
        // judged only when some mask could be read: with none, the read errors already say why
        if (cases.stream().anyMatch(c -> c.geometry() != null)) {
            StudyProblem nothing = Analysability.noStructureVoxels(structures, labels, where);
            if (nothing != null) {
                problems.add(nothing);
            }
        }
        return new InspectionReport(study.root(), study.manifest(), protocol.study(), study.centres(), study.readers(),
            cases, labels, structures, study.missing(InspectionReport.LIST_CAP), problems, study.missingCount());
    }

    private record CaseResult(InspectionReport.CaseSummary summary, List<StudyProblem> problems) {
    }

    private static CaseResult inspectCase(Study study, String caseId, Protocol protocol, ReadLimits limits) {
        List<StudyProblem> problems = new ArrayList<>();
        SortedMap<Integer, Long> labels = new TreeMap<>();
        List<ReaderId> readers = new ArrayList<>();
        Geometry ref = null;
        Path refPath = null;
        double tol = protocol.geometryToleranceMm();
        for (MaskRef m : study.masksOf(caseId)) {
            readers.add(m.reader());
            LabelVolume v;
            try {
                v = CaseLoader.readMask(m.path(), limits);
            } catch (InputException e) {
                problems.add(StudyProblem.error(m.path(), "unreadable mask: " + e.problem()));
                continue;
            }
            if (ref == null) {
                ref = v.geometry();
                refPath = m.path();
            } else {
                InputException mismatch = CaseLoader.mismatch(refPath, ref, m.path(), v.geometry(), tol);
                if (mismatch != null) {
                    problems.add(StudyProblem.error(m.path(), mismatch.problem()));
                }
            }
            for (Map.Entry<Integer, Long> e : v.labelCounts().entrySet()) {
                if (e.getKey() != 0) {
                    labels.merge(e.getKey(), e.getValue(), Long::sum);
                }
            }
        }
        Path image = study.imageOf(caseId);
        if (image != null) {
            try {
                Geometry g = Volumes.readGeometry(image, limits);
                if (ref != null) {
                    String diff = ref.differenceFrom(g, tol);
                    if (diff != null) {
                        problems.add(StudyProblem.error(image, "image grid differs from " + refPath + ": " + diff
                            + " (tolerance " + tol + " mm)"));
                    }
                }
            } catch (InputException e) {
                problems.add(StudyProblem.error(image, "unreadable image: " + e.problem()));
            }
        }
        return new CaseResult(new InspectionReport.CaseSummary(caseId, readers, ref, labels, image), problems);
    }
}
