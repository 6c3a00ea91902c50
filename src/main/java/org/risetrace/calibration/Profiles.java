package org.risetrace.calibration;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.exc.UnrecognizedPropertyException;
import org.risetrace.frame.InputRejected;
import org.risetrace.frame.JsonFieldLocation;

import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;

/**
 * Finds calibration profiles. A reference that ends in {@code .json} or contains a path separator is a file
 * (relative to {@code baseDir}, the series folder, when one is given; else to the working directory); otherwise
 * it is a name, looked up as {@code ./calibration/NAME.json} in the working directory and then among the
 * profiles bundled in the jar.
 */
public final class Profiles {
    /** Names of the profiles bundled with the tool (the files in the repository's calibration/ folder). */
    public static final List<String> BUNDLED = List.of("u16-centikelvin", "u16-decikelvin", "f32-celsius", "f32-kelvin",
            "u8-span", "matrix-celsius");

    private static final ObjectMapper JSON = org.risetrace.frame.StrictJson.builder()
            .enable(DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES)
            // a missing number is reported by validate() by its name, not as a "wrong type"
            .disable(DeserializationFeature.FAIL_ON_NULL_FOR_PRIMITIVES).build();

    private Profiles() {
    }

    public static Profile load(String reference) {
        return load(reference, null);
    }

    /**
     * Loads a profile by name or path; {@code baseDir} resolves relative paths (may be null). With a
     * {@code baseDir} (a path written in series.json) the file must lie inside that folder: a series handed over by
     * someone else must not make the tool open files elsewhere ({@code ../../}, absolute paths).
     */
    public static Profile load(String reference, Path baseDir) {
        if (reference == null || reference.isBlank())
            throw new InputRejected(null, "no calibration profile named", "known profiles: " + String.join(", ", BUNDLED));
        boolean isPath = reference.endsWith(".json") || reference.contains("/") || reference.contains("\\");
        if (isPath) {
            Path p;
            try {
                p = Path.of(reference);
            } catch (java.nio.file.InvalidPathException e) {
                throw new InputRejected(baseDir, "the profile path is not a valid file name");
            }
            if (!p.isAbsolute() && baseDir != null) p = baseDir.resolve(p);
            if (baseDir != null) confine(p, baseDir);
            org.risetrace.frame.InputFiles.requireRegularFile(p, "calibration profile");
            byte[] json = org.risetrace.frame.InputFiles.readDocument(p, "calibration profile");
            try {
                return validate(parse(new java.io.ByteArrayInputStream(json), p), p);
            } catch (IOException e) {
                throw new InputRejected(p, "cannot read the calibration profile: " + e.getMessage());
            }
        }
        Path local = Path.of("calibration", reference + ".json");
        if (Files.isRegularFile(local)) return load(local.toString(), null);
        try (InputStream in = Profiles.class.getResourceAsStream("/calibration/" + reference + ".json")) {
            if (in == null)
                throw new InputRejected(null, "unknown calibration profile '" + reference + "'",
                        "known profiles: " + String.join(", ", known()));
            Path pseudo = Path.of("calibration", reference + ".json");
            return validate(parse(in, pseudo), pseudo);
        } catch (IOException e) {
            throw new InputRejected(null, "cannot read bundled profile " + reference + ": " + e.getMessage());
        }
    }

    /** Refuses a profile path from series.json that leads out of the series folder (also through links). */
    private static void confine(Path p, Path baseDir) {
        Path base = baseDir.toAbsolutePath().normalize(), file = p.toAbsolutePath().normalize();
        boolean inside = file.startsWith(base);
        if (inside && Files.exists(file)) {
            try {
                inside = file.toRealPath().startsWith(base.toRealPath());
            } catch (IOException e) {
                inside = false;
            }
        }
        if (!inside)
            throw new InputRejected(base.resolve("series.json"), "the profile path leads out of the series folder",
                    "put the profile file into the series folder, or name a profile with --profile");
    }

    /** Bundled profile names plus those in ./calibration/ of the working directory. */
    public static List<String> known() {
        java.util.TreeSet<String> names = new java.util.TreeSet<>(BUNDLED);
        Path local = Path.of("calibration");
        if (Files.isDirectory(local)) {
            try (java.util.stream.Stream<Path> s = Files.list(local)) {
                s.map(p -> p.getFileName().toString()).filter(n -> n.endsWith(".json"))
                        // the materials table and Sakuma-Hattori curve files live beside the profiles
                        .filter(n -> !n.equals("materials.json") && !n.endsWith(".sakuma-hattori.json"))
                        .forEach(n -> names.add(n.substring(0, n.length() - 5)));
            } catch (IOException ignored) {
                // the bundled names are still right
            }
        }
        return List.copyOf(names);
    }

    private static Profile parse(InputStream in, Path file) throws IOException {
        byte[] json = in.readAllBytes();
        try {
            Profile p = JSON.readValue(json, Profile.class);
            if (p == null) throw new InputRejected(file, "the profile is empty (null)", "write a JSON object {...}");
            return p;
        } catch (UnrecognizedPropertyException e) {
            String at = fieldLocation(json, e.getPropertyName());
            if (at.isEmpty()) at = " at line " + e.getLocation().getLineNr() + ", column " + e.getLocation().getColumnNr();
            throw new InputRejected(file, "unknown field '" + e.getPropertyName() + "'" + at,
                    "known fields: name, description, encoding, gain, offset, unit, span_c, netd_k, band_um, "
                            + "default_emissivity");
        } catch (JsonProcessingException e) {
            String dup = org.risetrace.frame.StrictJson.duplicateKey(e);
            if (dup != null) throw new InputRejected(file, dup, "give each field once");
            String at = e.getLocation() == null ? "" : " at line " + e.getLocation().getLineNr() + ", column "
                    + e.getLocation().getColumnNr();
            // the file's own text is not repeated: the path may name a file that is no profile at all
            if (e instanceof com.fasterxml.jackson.databind.JsonMappingException m && !m.getPath().isEmpty())
                throw new InputRejected(file, "field '" + m.getPath().get(0).getFieldName() + "' has the wrong type" + at);
            throw new InputRejected(file, "not a JSON profile (malformed JSON" + at + ")");
        }
    }

    /** Line and column of a field name in JSON text (see {@link JsonFieldLocation}). */
    static String fieldLocation(byte[] json, String field) {
        return JsonFieldLocation.of(json, field);
    }

    private static Profile validate(Profile p, Path file) {
        String enc = p.encoding() == null ? "" : p.encoding().toLowerCase(Locale.ROOT);
        switch (enc) {
            case "linear" -> {
                if (p.gain() == null || p.offset() == null || p.gain() == 0 || !Double.isFinite(p.gain())
                        || !Double.isFinite(p.offset()))
                    throw new InputRejected(file, "a linear profile needs a non-zero 'gain' and an 'offset'");
                requireUnit(p, file);
            }
            case "float", "matrix" -> requireUnit(p, file);
            case "span" -> {
                if (p.spanC() != null && (p.spanC().length != 2 || !(p.spanC()[1] > p.spanC()[0])
                        || !Double.isFinite(p.spanC()[0]) || !Double.isFinite(p.spanC()[1])))
                    throw new InputRejected(file, "'span_c' must be [low, high] with high > low");
            }
            default -> throw new InputRejected(file, "field 'encoding' must be linear, float, span or matrix, not '"
                    + p.encoding() + "'");
        }
        if (!(p.netdK() > 0 && p.netdK() < 100)) throw new InputRejected(file, "field 'netd_k' must be a positive number of kelvin");
        if (p.bandUm() == null || p.bandUm().length != 2 || !(p.bandUm()[1] > p.bandUm()[0]) || p.bandUm()[0] <= 0
                || !(p.bandUm()[1] <= 1000))
            throw new InputRejected(file, "field 'band_um' must be [from, to] micrometres with to > from > 0");
        if (!(p.defaultEmissivity() > 0 && p.defaultEmissivity() <= 1))
            throw new InputRejected(file, "field 'default_emissivity' must be in (0, 1]");
        if (p.name() == null || p.name().isBlank()) throw new InputRejected(file, "field 'name' is missing");
        return p;
    }

    private static void requireUnit(Profile p, Path file) {
        if (!"K".equalsIgnoreCase(p.unit()) && !"C".equalsIgnoreCase(p.unit()))
            throw new InputRejected(file, "field 'unit' must be \"K\" or \"C\"");
    }
}
