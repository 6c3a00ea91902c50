package org.risetrace.calibration;

import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import org.risetrace.frame.InputRejected;

import java.io.IOException;
import java.nio.file.FileAlreadyExistsException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Pattern;

/**
 * Writes a calibration result as a profile {@code <name>.json} (what {@link Profiles#load} reads) and, for a
 * Sakuma-Hattori fit, the curve beside it as {@code <name>.sakuma-hattori.json}. Never replaces an existing file
 * or shadows a bundled profile unless told to; files are written to a temporary name and moved into place.
 */
public final class ProfileWriter {
    private static final Pattern NAME = Pattern.compile("[A-Za-z0-9][A-Za-z0-9._-]{0,99}");
    private static final ObjectMapper JSON = new ObjectMapper().enable(SerializationFeature.INDENT_OUTPUT);

    private ProfileWriter() {
    }

    /**
     * The Sakuma-Hattori curve file.
     *
     * @param profile                the profile it belongs to
     * @param equation               the equation, spelled out
     * @param c                      C, counts
     * @param aUm                    A, micrometres
     * @param bUmK                   B, micrometre-kelvin
     * @param c2UmK                  c2 used, micrometre-kelvin
     * @param rangeC                 calibrated range of known temperatures, degrees Celsius
     * @param linearisationMaxErrorK largest error of the profile's linear approximation over that range
     * @param points                 the reference points and their residuals
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record CurveFile(
            @JsonProperty("profile") String profile,
            @JsonProperty("equation") String equation,
            @JsonProperty("c") double c,
            @JsonProperty("a_um") double aUm,
            @JsonProperty("b_um_k") double bUmK,
            @JsonProperty("c2_um_k") double c2UmK,
            @JsonProperty("range_c") double[] rangeC,
            @JsonProperty("linearisation_max_error_k") double linearisationMaxErrorK,
            @JsonProperty("points") List<CurvePoint> points) {
    }

    /** One reference point in the curve file. */
    public record CurvePoint(@JsonProperty("target") String target, @JsonProperty("count") double count,
                             @JsonProperty("known_c") double knownC, @JsonProperty("residual_k") double residualK) {
    }

    /** Checks a new profile name: letters, digits, '.', '_' and '-', not a path and without ".json". */
    public static void requireName(String name) {
        if (name == null || !NAME.matcher(name).matches() || name.toLowerCase(java.util.Locale.ROOT).endsWith(".json"))
            throw new InputRejected(null, "profile name '" + name + "' must be letters, digits, '.', '_' or '-'"
                    + " (no path, no .json)");
    }

    /**
     * Writes the files and returns the paths written (profile first).
     *
     * @param force replace existing files and allow a bundled profile's name
     */
    public static List<Path> write(CalibrationResult result, Path outDir, boolean force) {
        String name = result.profile().name();
        requireName(name);
        Path profileFile = outDir.resolve(name + ".json");
        Path curveFile = outDir.resolve(name + ".sakuma-hattori.json");
        List<Path> targets = new ArrayList<>(List.of(profileFile));
        if (result.curve() != null) targets.add(curveFile);
        if (!force) {
            if (Profiles.BUNDLED.contains(name))
                throw new InputRejected(profileFile, "'" + name + "' is a bundled profile's name; nothing was written",
                        "pick another --name, or add --force to shadow it");
            for (Path p : targets)
                if (Files.exists(p))
                    throw new InputRejected(p, "exists already; nothing was written",
                            "pick another --name, or add --force to replace it");
        }
        try {
            Files.createDirectories(outDir);
            byte[] profileJson = JSON.writeValueAsBytes(result.profile());
            byte[] curveJson = result.curve() == null ? null : JSON.writeValueAsBytes(curveFile(result));
            if (curveJson != null) place(curveFile, curveJson, force);
            place(profileFile, profileJson, force);
        } catch (IOException e) {
            throw new InputRejected(outDir, "cannot write the profile: " + e.getMessage());
        }
        return targets;
    }

    private static CurveFile curveFile(CalibrationResult r) {
        List<CurvePoint> pts = new ArrayList<>();
        for (int i = 0; i < r.points().size(); i++) {
            ReferencePoint p = r.points().get(i);
            pts.add(new CurvePoint(p.label(), p.signal(), p.knownC(), r.residualK()[i]));
        }
        SakumaHattori c = r.curve();
        return new CurveFile(r.profile().name(), "count = c / (exp(c2 / (a * T + b)) - 1), T in kelvin",
                c.c(), c.aUm(), c.bUmK(), SakumaHattori.C2_UM_K, r.rangeC(), r.linearisationMaxErrorK(), pts);
    }

    private static void place(Path target, byte[] bytes, boolean force) throws IOException {
        Path tmp = org.risetrace.frame.TemporaryFiles.beside(target.getParent(), target.getFileName().toString());
        try {
            if (force) org.risetrace.frame.TemporaryFiles.keepPermissions(target, tmp);
            Files.write(tmp, bytes);
            if (force) Files.move(tmp, target, StandardCopyOption.REPLACE_EXISTING, StandardCopyOption.ATOMIC_MOVE);
            else Files.move(tmp, target); // fails rather than replace a file that appeared meanwhile
        } catch (FileAlreadyExistsException e) {
            throw new InputRejected(target, "exists already; not replaced", "pick another --name, or add --force");
        } finally {
            Files.deleteIfExists(tmp);
        }
    }
}
