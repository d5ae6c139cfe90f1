package org.accordia.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;

/** The README's quick start stays two commands, and it names every command the tool has. */
class ReadmeTest {

    @Test
    void quickStartIsTwoCommandsAndEveryCommandIsListed() throws Exception {
        String readme = Files.readString(Path.of("README.md"));
        int start = readme.indexOf("## Quick start");
        int open = readme.indexOf("```\n", start);
        int close = readme.indexOf("```", open + 4);
        List<String> commands = readme.substring(open + 4, close).lines().filter(l -> !l.isBlank()).toList();
        assertEquals(List.of("./accordia analyze demo-masks", "mvn -B verify"), commands);
        for (String name : Main.commandLine().getSubcommands().keySet()) {
            if (!name.equals("help") && !name.equals("analyze")) {
                assertTrue(readme.contains("- `" + name), "README lists " + name);
            }
        }
        assertTrue(readme.contains("`protocol.yaml`"), "README says demo writes protocol.yaml");
    }
}
