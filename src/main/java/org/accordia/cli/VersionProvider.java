package org.accordia.cli;

import picocli.CommandLine;

/** Reports the version recorded in the jar manifest (or "development" when run from classes). */
public final class VersionProvider implements CommandLine.IVersionProvider {
    public static String version() {
        String v = Main.class.getPackage().getImplementationVersion();
        return v == null ? "development" : v;
    }

    @Override
    public String[] getVersion() {
        return new String[] {"accordia " + version()};
    }
}
