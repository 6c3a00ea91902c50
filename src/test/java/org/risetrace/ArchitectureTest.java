package org.risetrace;

import com.tngtech.archunit.core.domain.JavaClasses;
import com.tngtech.archunit.core.importer.ClassFileImporter;
import com.tngtech.archunit.core.importer.ImportOption;
import org.junit.jupiter.api.Test;

import static com.tngtech.archunit.lang.syntax.ArchRuleDefinition.noClasses;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** Keeps the pipeline's dependency arrows (DEVELOPERS.md, "The pipeline") true. */
class ArchitectureTest {
    private static final JavaClasses CLASSES = new ClassFileImporter()
            .withImportOption(ImportOption.Predefined.DO_NOT_INCLUDE_TESTS)
            .importPackages("org.risetrace");

    /** Packages the conventions plan but that are not built yet; a rule about them applies once they exist. */
    private static final java.util.Set<String> PLANNED = java.util.Set.of("batch");

    private static boolean present(String pkg) {
        String name = "org.risetrace." + pkg;
        return CLASSES.stream().anyMatch(c -> c.getPackageName().equals(name) || c.getPackageName().startsWith(name + "."));
    }

    /**
     * No class of {@code pkg} may use the forbidden packages. The rule never passes on an empty set of classes
     * (ArchUnit's default): a package that is not planned must exist, so a renamed package fails here instead of
     * silently passing; a planned package that does not exist yet is skipped, and checked as soon as it appears.
     */
    private static void mayNotUse(String pkg, String... forbidden) {
        if (!present(pkg)) {
            assertTrue(PLANNED.contains(pkg), "package org.risetrace." + pkg + " has no classes");
            return;
        }
        String[] full = new String[forbidden.length];
        for (int i = 0; i < forbidden.length; i++) full[i] = "org.risetrace." + forbidden[i] + "..";
        noClasses().that().resideInAPackage("org.risetrace." + pkg + "..")
                .should().dependOnClassesThat().resideInAnyPackage(full)
                .check(CLASSES);
    }

    @Test
    void everyPipelinePackageHasClasses() {
        for (String pkg : new String[]{"frame", "io", "calibration", "board", "registration", "analysis", "report",
                "sim", "cli", "planning", "web", "archive"})
            assertTrue(present(pkg), "org.risetrace." + pkg);
        assertFalse(present("no_such_stage"), "the presence check can fail");
    }

    @Test
    void frameDependsOnNothingOfOurs() {
        mayNotUse("frame", "io", "calibration", "board", "registration", "analysis", "report", "sim", "cli", "web",
                "archive", "batch", "planning");
    }

    @Test
    void numericRoutinesDependOnNothingOfOurs() {
        // order statistics and the like, shared by registration and analysis: a foundation like frame
        mayNotUse("numeric", "frame", "io", "calibration", "board", "registration", "analysis", "report", "sim", "cli",
                "web", "archive", "batch", "planning", "bench");
    }

    @Test
    void coreNeverDependsOnUserInterfaces() {
        for (String core : new String[]{"frame", "numeric", "io", "calibration", "board", "registration", "analysis", "report",
                "sim", "archive", "batch", "planning", "bench"})
            mayNotUse(core, "cli", "web");
    }

    @Test
    void theWorkbenchCallsTheCoreNotTheCommandLine() {
        // the web workbench (issue 12) is a user interface beside the CLI: it reuses the core's entry points, never
        // a command class (the CLI may start it: ServeCommand)
        mayNotUse("web", "cli");
    }

    @Test
    void earlyStagesDoNotReachDownstream() {
        mayNotUse("io", "board", "registration", "analysis", "report", "sim", "planning");
        mayNotUse("calibration", "io", "board", "registration", "analysis", "report", "sim", "planning");
        mayNotUse("board", "io", "registration", "analysis", "report", "sim", "planning");
        mayNotUse("registration", "io", "analysis", "report", "sim", "planning");
        mayNotUse("analysis", "report", "sim");
        mayNotUse("report", "sim");
    }

    @Test
    void planningUsesOnlyFrameAndTheSidecar() {
        // the planner and the bench readings come before the camera: nothing downstream of import
        mayNotUse("planning", "calibration", "board", "registration", "analysis", "report", "sim", "archive", "batch");
    }

    @Test
    void onlyTheUserInterfacesUseTheBatchRunner() {
        for (String stage : new String[]{"frame", "io", "calibration", "board", "registration", "analysis", "report",
                "sim", "planning", "archive"})
            mayNotUse(stage, "batch");
    }

    @Test
    void theArchiveSitsAboveTheAnalysisAndNothingOfTheCoreUsesIt() {
        // the evidence archive stores what import, board, analysis and report make; it never drives a user
        // interface, the batch runner, the simulator or the planner
        mayNotUse("archive", "cli", "web", "batch", "sim", "planning");
        for (String stage : new String[]{"frame", "io", "calibration", "board", "registration", "analysis", "report",
                "sim", "planning"})
            mayNotUse(stage, "archive");
    }

    @Test
    void onlyTheUserInterfacesUseTheBenchmark() {
        for (String stage : new String[]{"frame", "io", "calibration", "board", "registration", "analysis", "report",
                "sim", "planning", "archive", "batch"})
            mayNotUse(stage, "bench");
    }

    @Test
    void simulatorUsesOnlyTheHomographyValueOfRegistration() {
        noClasses().that().resideInAPackage("org.risetrace.sim..")
                .should().dependOnClassesThat(
                        com.tngtech.archunit.base.DescribedPredicate.describe("registration classes other than Homography",
                                (com.tngtech.archunit.core.domain.JavaClass c) ->
                                        c.getBaseComponentType().getPackageName().startsWith("org.risetrace.registration")
                                                && !c.getBaseComponentType().getName()
                                                .equals("org.risetrace.registration.Homography")))
                .check(CLASSES);
        mayNotUse("sim", "analysis", "report");
    }
}
