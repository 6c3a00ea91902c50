package org.risetrace.cli;

import org.risetrace.calibration.CalibrationModel;
import org.risetrace.calibration.CalibrationResult;
import org.risetrace.calibration.Profile;
import org.risetrace.calibration.ProfileWriter;
import org.risetrace.calibration.ReferencePoint;
import org.risetrace.calibration.ReferenceTarget;
import org.risetrace.calibration.TargetCalibration;
import org.risetrace.frame.Frame;
import org.risetrace.frame.InputRejected;
import org.risetrace.io.ReadContext;
import org.risetrace.io.Series;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;

/** {@code risetrace calibrate}: fits a new profile to frames of reference targets at known temperatures. */
@Command(name = "calibrate", mixinStandardHelpOptions = true,
        description = "Fits a calibration profile to frames of reference targets at known temperatures.")
public final class CalibrateCommand implements Callable<Integer> {
    @Option(names = "--frames", required = true, arity = "1..*", paramLabel = "FILE|FOLDER",
            description = "Frames of the reference targets: files, or folders of frames.")
    List<Path> frames;

    @Option(names = "--target", required = true, paramLabel = "x,y,w,h=T_C[@frame]",
            converter = TargetConverter.class,
            description = "A reference target: region in frame pixels (left, top, width, height) = known degrees "
                    + "Celsius; @file limits it to one frame. Repeat for each target.")
    List<ReferenceTarget> targets;

    @Option(names = "--profile", paramLabel = "PROFILE",
            description = "Base profile the frames are read with (a linear count profile; default: series.json's, "
                    + "else the default for the samples).")
    String profile;

    @Option(names = "--model", paramLabel = "MODEL", defaultValue = "gain-offset", converter = ModelConverter.class,
            description = "offset (1+ targets), gain-offset (2+, default) or sakuma-hattori (3+).")
    CalibrationModel model;

    @Option(names = "--name", required = true, paramLabel = "NAME", description = "Name of the new profile.")
    String name;

    @Option(names = "--out", paramLabel = "FOLDER", defaultValue = "calibration",
            description = "Folder to write the profile into (default: ./calibration).")
    Path out;

    @Option(names = "--force", description = "Replace an existing profile file of that name.")
    boolean force;

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Override
    public Integer call() {
        ProfileWriter.requireName(name);
        List<Frame> read = new ArrayList<>();
        Profile base = null;
        List<Path> files = new ArrayList<>();
        List<Series> series = new ArrayList<>();
        for (Path p : frames) {
            if (Files.isDirectory(p)) series.add(Series.open(p, profile, ReadContext.DEFAULT_MAX_PIXELS));
            else files.add(p);
        }
        if (!files.isEmpty()) series.add(Series.open(files, null, profile));
        PrintWriter err = spec.commandLine().getErr();
        for (Series s : series) {
            if (base == null) base = s.profile();
            else if (!base.name().equals(s.profile().name()))
                throw new InputRejected(s.folder(), "frames read with profile '" + s.profile().name()
                        + "' where others use '" + base.name() + "'", "give --profile to read them all alike");
            // frame times and assumed defaults do not matter here; files left out do
            for (String w : s.warnings()) if (w.startsWith("skipped")) err.println("risetrace: " + w);
            for (Frame f : s) read.add(f);
        }
        CalibrationResult r = TargetCalibration.calibrate(read, targets, base, model, name);
        List<Path> written = ProfileWriter.write(r, out, force);

        PrintWriter o = spec.commandLine().getOut();
        o.printf(Locale.ROOT, "%s fit of %d target%s in %d frame%s (base profile %s)%n", model, targets.size(),
                targets.size() == 1 ? "" : "s", read.size(), read.size() == 1 ? "" : "s", base.name());
        o.printf(Locale.ROOT, "%-28s %12s %10s %10s %10s %12s%n", "target", "mean count", "known C", "new C",
                "resid K", "spread K");
        for (int i = 0; i < r.points().size(); i++) {
            ReferencePoint p = r.points().get(i);
            double newC = r.profile().countToCelsius(p.signal());
            o.printf(Locale.ROOT, "%-28s %12.2f %10.3f %10.3f %+10.3f %12.3f%n", p.label(), p.signal(), p.knownC(),
                    newC, r.profileResidualK()[i], p.spreadK());
        }
        if (r.curve() != null)
            o.printf(Locale.ROOT, "Sakuma-Hattori: C = %.6g, A = %.6g um, B = %.6g um K; curve residuals up to %.3f K;"
                            + " straight-line profile within %.3f K of the curve%n", r.curve().c(), r.curve().aUm(),
                    r.curve().bUmK(), maxAbs(r.residualK()), r.linearisationMaxErrorK());
        o.printf(Locale.ROOT, "gain %.9g, offset %.9g %s; residuals rms %.3f K, max %.3f K%n", r.profile().gain(),
                r.profile().offset(), r.profile().unit(), r.rmsResidualK(), r.maxResidualK());
        for (String note : r.notes()) err.println("risetrace: " + note);
        for (Path p : written) o.println("wrote " + p);
        return Main.EXIT_OK;
    }

    private static double maxAbs(double[] v) {
        double m = 0;
        for (double x : v) m = Math.max(m, Math.abs(x));
        return m;
    }

    static final class TargetConverter implements CommandLine.ITypeConverter<ReferenceTarget> {
        @Override
        public ReferenceTarget convert(String value) {
            try {
                return ReferenceTarget.parse(value);
            } catch (IllegalArgumentException e) {
                throw new CommandLine.TypeConversionException(e.getMessage());
            }
        }
    }

    static final class ModelConverter implements CommandLine.ITypeConverter<CalibrationModel> {
        @Override
        public CalibrationModel convert(String value) {
            try {
                return CalibrationModel.parse(value);
            } catch (IllegalArgumentException e) {
                throw new CommandLine.TypeConversionException(e.getMessage());
            }
        }
    }
}
