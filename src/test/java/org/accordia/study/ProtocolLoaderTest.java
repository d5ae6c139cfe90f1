package org.accordia.study;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.TreeSet;
import org.accordia.io.InputException;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

class ProtocolLoaderTest {
    @TempDir
    Path dir;

    private Path write(String name, String text) throws IOException {
        Path p = dir.resolve(name);
        Files.writeString(p, text);
        return p;
    }

    private InputException refused(String text) throws IOException {
        Path p = write("p.yaml", text);
        InputException e = assertThrows(InputException.class, () -> Protocol.load(p));
        assertTrue(e.getMessage().startsWith(p.toString() + ": "), "file named first: " + e.getMessage());
        assertFalse(e.getMessage().contains("\n"), "one line: " + e.getMessage());
        return e;
    }

    @Test
    void demoProtocolMatchesTheDemoStudy() throws Exception {
        Protocol p = Protocol.load(Path.of("protocols/demo.yaml"));
        assertEquals(List.of(new Structure("lesion", List.of(1, 2), 2.0), new Structure("core", List.of(2), 1.5)),
            p.structures());
        assertEquals(20261202L, p.seed());
        assertEquals(Protocol.Hd95Mode.PER_DIRECTION, p.agreement().hd95());
        assertEquals(9999, p.shift().permutations());
        assertEquals(0.70, p.review().adjudicationDice());
        // every other value in demo.yaml equals the documented default
        Protocol d = Protocol.defaults();
        assertEquals(d.shift(), p.shift());
        assertEquals(d.review(), p.review());
        assertEquals(d.consensus(), p.consensus());
        assertEquals(d.geometryToleranceMm(), p.geometryToleranceMm());
        assertEquals(d.maxVoxels(), p.maxVoxels());
    }

    @Test
    void emptyFileGivesDefaultsAndOneStructurePerLabel() throws Exception {
        Protocol p = Protocol.load(write("empty.yaml", "# nothing\n"));
        assertEquals(Protocol.defaults(), p);
        assertNull(p.study());
        assertEquals(List.of(Structure.ofLabel(1), Structure.ofLabel(3)), p.structuresFor(new TreeSet<>(List.of(0, 1, 3))));
    }

    @Test
    void scalarLabelIsOneLabel() throws Exception {
        Protocol p = Protocol.load(write("p.yaml", "structures:\n  - name: a\n    labels: 4\n"));
        assertEquals(List.of(4), p.structures().get(0).labels());
        assertEquals(Structure.DEFAULT_TOLERANCE_MM, p.structures().get(0).toleranceMm());
    }

    @Test
    void unknownKeyNamesItsPath() throws Exception {
        InputException e = refused("shift:\n  alpa: 0.05\n");
        assertTrue(e.problem().startsWith("shift.alpa: unknown key"), e.getMessage());
        InputException top = refused("seeed: 3\n");
        assertTrue(top.problem().startsWith("seeed: unknown key"), top.getMessage());
        InputException nested = refused("structures:\n  - name: a\n    labels: [1]\n    tolerance: 2\n");
        assertTrue(nested.problem().startsWith("structures[0].tolerance: unknown key"), nested.getMessage());
    }

    @Test
    void wrongTypeNamesKeyAndExpectedType() throws Exception {
        InputException e = refused("shift:\n  alpha: \"small\"\n");
        assertTrue(e.problem().contains("shift.alpha: expected a number"), e.getMessage());
        InputException b = refused("seed: true\n");
        assertTrue(b.problem().contains("seed: expected an integer"), b.getMessage());
        InputException m = refused("review: 3\n");
        assertTrue(m.problem().contains("review: expected a mapping"), m.getMessage());
        InputException s = refused("structures: {name: a}\n");
        assertTrue(s.problem().contains("structures: expected a list"), s.getMessage());
        InputException en = refused("agreement:\n  hd95: mean\n");
        assertTrue(en.problem().contains("agreement.hd95: unknown value \"mean\" (expected one of: per_direction, pooled)"),
            en.getMessage());
    }

    @ParameterizedTest
    @CsvSource(delimiter = '|', value = {
        "shift: {alpha: 1.5}|shift.alpha: must lie strictly between 0 and 1",
        "shift: {alpha: 0}|shift.alpha: must lie strictly between 0 and 1",
        "shift: {permutations: 10}|shift.permutations: must be an integer between 99",
        "geometry_tolerance_mm: 0|geometry_tolerance_mm: must be positive",
        "max_voxels: 0|max_voxels: must lie between 1",
        "review: {adjudication_dice: 1.2}|review.adjudication_dice: must lie between 0 and 1",
        "consensus: {bootstrap_resamples: 5}|consensus.bootstrap_resamples: must be an integer between 100",
        "structures: [{name: a, labels: [0]}]|structures[0].labels[0]: must be an integer between 1",
        "structures: [{name: a, labels: [1, 1]}]|structures[0].labels[1]: label 1 is listed twice",
        "structures: [{name: a, labels: [1]}, {name: a, labels: [2]}]|structures[1].name: structure name 'a' is already used",
        "structures: [{name: a, labels: [1], tolerance_mm: -1}]|structures[0].tolerance_mm: must be positive",
        "structures: [{labels: [1]}]|structures[0]: missing key 'name'",
        "structures: []|structures: must list at least one structure",
    })
    void outOfRangeValuesAreRefused(String yaml, String expected) throws Exception {
        InputException e = refused(yaml + "\n");
        assertTrue(e.problem().startsWith(expected), e.getMessage());
    }

    @Test
    void duplicateKeyIsRefused() throws Exception {
        InputException e = refused("seed: 1\nseed: 2\n");
        assertTrue(e.problem().contains("duplicate key"), e.getMessage());
    }

    /** The classic "billion laughs" entity expansion, in YAML aliases (common practice in parser hardening). */
    @Test
    void aliasBombIsRefused() throws Exception {
        String bomb = String.join("\n",
            "a: &a [\"lol\",\"lol\",\"lol\",\"lol\",\"lol\",\"lol\",\"lol\",\"lol\",\"lol\"]",
            "b: &b [*a,*a,*a,*a,*a,*a,*a,*a,*a]",
            "c: &c [*b,*b,*b,*b,*b,*b,*b,*b,*b]",
            "d: &d [*c,*c,*c,*c,*c,*c,*c,*c,*c]",
            "e: &e [*d,*d,*d,*d,*d,*d,*d,*d,*d]",
            "f: &f [*e,*e,*e,*e,*e,*e,*e,*e,*e]",
            "g: &g [*f,*f,*f,*f,*f,*f,*f,*f,*f]",
            "h: &h [*g,*g,*g,*g,*g,*g,*g,*g,*g]",
            "i: &i [*h,*h,*h,*h,*h,*h,*h,*h,*h]") + "\n";
        InputException e = refused(bomb);
        assertTrue(e.problem().contains("aliases"), e.getMessage());
    }

    @Test
    void tooLargeDocumentIsRefused() throws Exception {
        String big = "study: \"" + "x".repeat(ProtocolLoader.MAX_CODE_POINTS + 10) + "\"\n";
        InputException e = refused(big);
        assertTrue(e.problem().startsWith("not a valid protocol file"), e.getMessage());
    }

    @Test
    void missingProtocolFile() {
        Path p = dir.resolve("nope.yaml");
        InputException e = assertThrows(InputException.class, () -> Protocol.load(p));
        assertEquals(p + ": protocol file not found", e.getMessage());
    }

    @Test
    void javaTypeTagsAreNotConstructed() throws Exception {
        InputException e = refused("study: !!javax.script.ScriptEngineManager [!!java.net.URLClassLoader [[]]]\n");
        assertTrue(e.problem().startsWith("not a valid protocol file"), e.getMessage());
    }
}
