package org.accordia.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@code inspect} and {@code analyze} read the same protocol the same way (the file given, else
 * the study's protocol.yaml, else the defaults) and judge analysability by one rule
 * ({@code org.accordia.study.Analysability}). The refusals are rows of the hostile corpus
 * (study-protocol-bad, study-protocol-folder, study-protocol-fifo, every-mask-empty,
 * every-mask-empty-named-structures), run through both commands there; here the accepted side.
 */
class InspectAnalyzeAgreeTest {

    @Test
    void inspectReadsTheDemoStudysProtocol() {
        CliRun r = CliRun.of("inspect", "demo-masks");
        assertEquals(ExitCodes.OK, r.code(), r.out() + r.err());
        String o = r.out();
        assertTrue(o.contains("Protocol: protocol.yaml in the study folder\n"), o);
        assertTrue(o.contains("  lesion = labels {1,2}, surface tolerance 2 mm\n"), o);
        assertTrue(o.contains("  core = labels {2}, surface tolerance 1.5 mm\n"), o);
        assertFalse(o.contains("label_1"), o);
        assertTrue(o.contains("Study: Lantern pilot (fictional demo)\n"), o);
    }

    @Test
    void aCopiedLayoutStudyDoesNotCallItsProtocolIgnored(@TempDir Path tmp) throws Exception {
        Path study = tmp.resolve("copy");
        AnalyzeCommandTest.copy(Path.of("demo-masks"), study);
        Files.delete(study.resolve("manifest.csv")); // read through the folder layout
        CliRun r = CliRun.of("inspect", study.toString());
        assertEquals(ExitCodes.OK, r.code(), r.out() + r.err());
        assertFalse(r.out().lines().anyMatch(l -> l.contains("protocol.yaml") && l.contains("ignored")), r.out());
        assertTrue(r.out().contains("  lesion = labels {1,2}"), r.out());
    }

    @Test
    void anExplicitProtocolWinsOverTheStudys(@TempDir Path tmp) throws Exception {
        Path p = tmp.resolve("mine.yaml");
        Files.writeString(p, "structures:\n  - name: whole\n    labels: [1, 2]\n");
        CliRun r = CliRun.of("inspect", "demo-masks", "--protocol", p.toString());
        assertEquals(ExitCodes.OK, r.code(), r.out() + r.err());
        assertTrue(r.out().contains("Protocol: the file given with --protocol (mine.yaml)\n"), r.out());
        assertTrue(r.out().contains("  whole = labels {1,2}"), r.out());
        assertFalse(r.out().contains("  lesion = "), r.out());
    }

    @Test
    void withoutAProtocolFileBothUseTheDefaults(@TempDir Path tmp) throws Exception {
        Path study = tmp.resolve("copy");
        AnalyzeCommandTest.copy(Path.of("demo-masks"), study);
        Files.delete(study.resolve("protocol.yaml"));
        CliRun r = CliRun.of("inspect", study.toString());
        assertEquals(ExitCodes.OK, r.code(), r.out() + r.err());
        assertTrue(r.out().contains("Protocol: built-in defaults"), r.out());
        assertTrue(r.out().contains("  label_1 = labels {1}"), r.out());
    }
}
