package org.risetrace.cli;

import picocli.CommandLine;

/** Prints the tool version from the jar manifest (or "dev" when run from classes). */
public final class VersionProvider implements CommandLine.IVersionProvider {
    public static String version() {
        String v = Main.class.getPackage().getImplementationVersion();
        return v == null ? "dev" : v;
    }

    @Override
    public String[] getVersion() {
        return new String[]{"risetrace " + version(), "Java " + System.getProperty("java.version")};
    }
}
