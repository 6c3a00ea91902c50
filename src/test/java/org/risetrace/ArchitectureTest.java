package org.risetrace;

import com.tngtech.archunit.core.domain.JavaClasses;
import com.tngtech.archunit.core.importer.ClassFileImporter;
import com.tngtech.archunit.core.importer.ImportOption;
import org.junit.jupiter.api.Test;

import static com.tngtech.archunit.lang.syntax.ArchRuleDefinition.noClasses;

/** Keeps the pipeline's dependency arrows (DEVELOPERS.md, "The pipeline") true. */
class ArchitectureTest {
    private static final JavaClasses CLASSES = new ClassFileImporter()
            .withImportOption(ImportOption.Predefined.DO_NOT_INCLUDE_TESTS)
            .importPackages("org.risetrace");

    private static void mayNotUse(String pkg, String... forbidden) {
        String[] full = new String[forbidden.length];
        for (int i = 0; i < forbidden.length; i++) full[i] = "org.risetrace." + forbidden[i] + "..";
        noClasses().that().resideInAPackage("org.risetrace." + pkg + "..")
                .should().dependOnClassesThat().resideInAnyPackage(full)
                .allowEmptyShould(true)
                .check(CLASSES);
    }

    @Test
    void frameDependsOnNothingOfOurs() {
        mayNotUse("frame", "io", "calibration", "board", "registration", "analysis", "report", "sim", "cli", "web",
                "archive", "batch", "planning");
    }

    @Test
    void coreNeverDependsOnUserInterfaces() {
        for (String core : new String[]{"frame", "io", "calibration", "board", "registration", "analysis", "report",
                "sim", "archive", "batch", "planning"})
            mayNotUse(core, "cli", "web");
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
