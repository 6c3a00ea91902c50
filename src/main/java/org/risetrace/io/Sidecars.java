package org.risetrace.io;

import com.fasterxml.jackson.core.JsonLocation;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.exc.UnrecognizedPropertyException;
import org.risetrace.frame.InputRejected;
import org.risetrace.frame.JsonFieldLocation;

import java.io.IOException;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.Map;

/** Reads and checks {@code series.json}; every problem names the file and, for JSON errors, line and column. */
public final class Sidecars {
    /** The sidecar's file name in a series folder. */
    public static final String FILE_NAME = "series.json";

    private static final ObjectMapper JSON = org.risetrace.frame.StrictJson.builder()
            .enable(DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES).build();

    private Sidecars() {
    }

    /**
     * Builds the sidecar's JSON reader ahead of the first file (a cold start spends about a tenth of a second on
     * it); for a background thread while the command line is parsed. Never fails.
     */
    public static void warmUp() {
        try {
            JSON.readValue("{}", Sidecar.class);
        } catch (Exception | LinkageError ignored) {
            // only a head start: load() reads (and reports) on its own
        }
    }

    public static Sidecar load(Path file) {
        Sidecar s;
        byte[] json = null;
        try {
            json = org.risetrace.frame.InputFiles.readDocument(file, "sidecar file");
            s = JSON.readValue(json, Sidecar.class);
        } catch (NoSuchFileException e) {
            throw new InputRejected(file, "sidecar file not found");
        } catch (UnrecognizedPropertyException e) {
            String where = fieldLocation(json, e.getPropertyName());
            throw new InputRejected(file, "unknown field '" + e.getPropertyName() + "'"
                    + (where.isEmpty() ? at(e.getLocation()) : where),
                    "known fields: " + e.getKnownPropertyIds());
        } catch (JsonProcessingException e) {
            String dup = org.risetrace.frame.StrictJson.duplicateKey(e);
            if (dup != null) throw new InputRejected(file, dup, "give each field once");
            String field = e instanceof com.fasterxml.jackson.databind.JsonMappingException m && !m.getPath().isEmpty()
                    ? " in field '" + pathOf(m) + "'" : "";
            throw new InputRejected(file, (field.isEmpty() ? "malformed JSON" : "wrong type" + field) + at(e.getLocation())
                    + ": " + org.risetrace.frame.StrictJson.plainProblem(e));
        } catch (IOException e) {
            throw new InputRejected(file, "cannot read the sidecar file: " + e.getMessage(), null, e);
        }
        if (s == null) throw new InputRejected(file, "the sidecar is empty (null)", "write a JSON object {...}");
        return validate(s, file);
    }

    private static String at(JsonLocation loc) {
        return loc == null ? "" : " at line " + loc.getLineNr() + ", column " + loc.getColumnNr();
    }

    /** The field's path, e.g. injection.start_s or frames.f0001.png.t_s. */
    private static String pathOf(com.fasterxml.jackson.databind.JsonMappingException e) {
        StringBuilder sb = new StringBuilder();
        for (com.fasterxml.jackson.databind.JsonMappingException.Reference r : e.getPath()) {
            if (r.getFieldName() != null) sb.append(sb.length() == 0 ? "" : ".").append(r.getFieldName());
            else if (r.getIndex() >= 0) sb.append('[').append(r.getIndex()).append(']');
        }
        return sb.toString();
    }

    /** Line and column of a field name in JSON text (see {@link JsonFieldLocation}). */
    static String fieldLocation(byte[] json, String field) {
        return JsonFieldLocation.of(json, field);
    }

    static Sidecar validate(Sidecar s, Path file) {
        if (s.frameIntervalS() != null && !(s.frameIntervalS() > 0 && Double.isFinite(s.frameIntervalS())))
            throw new InputRejected(file, "field 'frame_interval_s' must be a positive number of seconds");
        checkSpan(s.spanC(), file, "span_c");
        if (s.reflectedC() != null && !(s.reflectedC() >= SampleMapping.ABSOLUTE_ZERO_C
                && s.reflectedC() <= SampleMapping.MAX_CELSIUS))
            throw new InputRejected(file, "field 'reflected_c' must be a temperature in degrees Celsius");
        if (s.frames() != null) {
            for (Map.Entry<String, Sidecar.FrameEntry> e : s.frames().entrySet()) {
                Sidecar.FrameEntry f = e.getValue();
                if (f == null) throw new InputRejected(file, "frames['" + e.getKey() + "'] is null");
                if (f.tS() != null && !Double.isFinite(f.tS()))
                    throw new InputRejected(file, "frames['" + e.getKey() + "'].t_s must be a number of seconds");
                checkSpan(f.spanC(), file, "frames['" + e.getKey() + "'].span_c");
            }
        }
        Sidecar.Injection inj = s.injection();
        if (inj != null) {
            if (inj.startS() != null && !Double.isFinite(inj.startS()))
                throw new InputRejected(file, "field 'injection.start_s' must be a number of seconds");
            if (inj.volts() != null && !(inj.volts() >= 0 && Double.isFinite(inj.volts())))
                throw new InputRejected(file, "field 'injection.volts' must be a non-negative number");
            if (inj.currentLimitA() != null && !(inj.currentLimitA() > 0 && Double.isFinite(inj.currentLimitA())))
                throw new InputRejected(file, "field 'injection.current_limit_a' must be a positive number of amperes");
            if (inj.plan() != null && !inj.plan().isObject())
                throw new InputRejected(file, "field 'injection.plan' must be a JSON object (written by risetrace plan)");
            if (inj.periodS() != null && !(inj.periodS() > 0 && Double.isFinite(inj.periodS())))
                throw new InputRejected(file, "field 'injection.period_s' must be a positive number of seconds");
            if (inj.onS() != null && inj.periodS() == null)
                throw new InputRejected(file, "field 'injection.on_s' needs 'injection.period_s'",
                        "give the period of the periodic injection too");
            if (inj.onS() != null && !(inj.onS() > 0 && inj.onS() < inj.periodS()))
                throw new InputRejected(file, "field 'injection.on_s' must lie between 0 and period_s (exclusive)");
            if (inj.switchS() != null) {
                if (inj.periodS() != null)
                    throw new InputRejected(file, "give either 'injection.period_s' or 'injection.switch_s', not both");
                double[] sw = inj.switchS();
                if (sw.length < 4)
                    throw new InputRejected(file, "field 'injection.switch_s' needs at least two on/off pairs (on, off, on, off)");
                for (int i = 0; i < sw.length; i++)
                    if (!Double.isFinite(sw[i]) || (i > 0 && !(sw[i] > sw[i - 1])))
                        throw new InputRejected(file, "field 'injection.switch_s' must be rising times in seconds (entry "
                                + (i + 1) + ")");
            }
        }
        return s;
    }

    private static void checkSpan(double[] span, Path file, String field) {
        if (span == null) return;
        if (span.length != 2 || !(span[1] > span[0]) || !Double.isFinite(span[0]) || !Double.isFinite(span[1]))
            throw new InputRejected(file, "field '" + field + "' must be [low, high] degrees Celsius with high > low");
    }
}
