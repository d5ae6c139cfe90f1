package org.accordia.io;

import static org.junit.jupiter.api.Assertions.assertDoesNotThrow;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;

/** The check that refuses a volume whose array could never fit the Java heap (see SmallHeapTest for the end-to-end run). */
class HeapCheckTest {
    @Test
    void arrayLargerThanTheHeapIsRefusedNamingFileAndSizes() {
        long max = Runtime.getRuntime().maxMemory();
        Path f = Path.of("big.nii.gz");
        InputException e = assertThrows(InputException.class, () -> Payload.checkHeap(f, max + 1, max + 1, "label"));
        assertTrue(e.getMessage().startsWith("big.nii.gz: the label volume of " + (max + 1) + " voxels needs "), e.getMessage());
        assertTrue(e.getMessage().contains("-Xmx"), e.getMessage());
    }

    @Test
    void arrayWithinTheHeapPasses() {
        assertDoesNotThrow(() -> Payload.checkHeap(Path.of("small.nii"), 1000, 4000, "image"));
    }
}
