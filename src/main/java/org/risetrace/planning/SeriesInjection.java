package org.risetrace.planning;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonMappingException;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import org.risetrace.frame.InputRejected;
import org.risetrace.io.Sidecar;
import org.risetrace.io.Sidecars;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.stream.Collectors;

/**
 * The plan in a series' series.json: {@link #write} puts it into the injection record (from_rail, to_rail, volts,
 * current_limit_a and the whole plan as {@code plan}) and leaves everything else in the file as it was;
 * {@link #planOf} reads it back, checked.
 */
public final class SeriesInjection {
    /** The copy of series.json as it was before the last write (a .json file: the series reader skips it). */
    public static final String BACKUP_FILE = "series.previous.json";
    /** The name the supply's negative lead is recorded under for rail-to-ground injection. */
    public static final String GROUND = "GND";

    private static final ObjectMapper JSON = new ObjectMapper();
    private static final ObjectMapper STRICT = new ObjectMapper()
            .enable(DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES)
            .enable(DeserializationFeature.FAIL_ON_NULL_FOR_PRIMITIVES)
            .enable(DeserializationFeature.FAIL_ON_TRAILING_TOKENS);

    private SeriesInjection() {
    }

    /**
     * Writes the plan into {@code seriesFolder/series.json} (created when missing). An existing file is checked
     * first (a broken one is refused, untouched), copied to {@link #BACKUP_FILE}, and replaced by a temporary file
     * renamed over it, so a crash leaves either the old or the new file. Returns the file written.
     */
    public static Path write(Path seriesFolder, InjectionPlan plan) {
        if (!Files.isDirectory(seriesFolder))
            throw new InputRejected(seriesFolder, "not a folder", "name the series folder that holds series.json");
        Path file = seriesFolder.resolve(Sidecars.FILE_NAME);
        boolean existed = Files.exists(file);
        ObjectNode root;
        if (existed) {
            Sidecars.load(file);
            try {
                JsonNode tree = JSON.readTree(file.toFile());
                if (!(tree instanceof ObjectNode o)) throw new InputRejected(file, "the sidecar is not a JSON object");
                root = o;
            } catch (IOException e) {
                throw new InputRejected(file, "cannot read: " + e.getMessage(), null, e);
            }
        } else {
            root = JSON.createObjectNode();
        }
        ObjectNode injection = root.get("injection") instanceof ObjectNode o ? o : root.putObject("injection");
        PlanRequest in = plan.inputs();
        boolean across = in.topology() == Topology.ACROSS_SWITCH;
        injection.put("from_rail", across ? in.highRail() : in.rail());
        injection.put("to_rail", across ? in.rail() : GROUND);
        injection.put("volts", plan.setVolts());
        injection.put("current_limit_a", plan.currentLimitA());
        injection.set("plan", JSON.valueToTree(plan));

        Path tmp = null;
        try {
            byte[] bytes = (JSON.writerWithDefaultPrettyPrinter().writeValueAsString(root) + "\n")
                    .getBytes(StandardCharsets.UTF_8);
            tmp = org.risetrace.frame.TemporaryFiles.beside(seriesFolder, "series.json");
            if (existed) org.risetrace.frame.TemporaryFiles.keepPermissions(file, tmp);
            Files.write(tmp, bytes);
            planOf(Sidecars.load(tmp).injection(), tmp); // the new file must read back; a failure here is our bug
            if (existed) Files.copy(file, seriesFolder.resolve(BACKUP_FILE), StandardCopyOption.REPLACE_EXISTING);
            try {
                Files.move(tmp, file, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
            } catch (AtomicMoveNotSupportedException e) {
                Files.move(tmp, file, StandardCopyOption.REPLACE_EXISTING);
            }
            tmp = null;
        } catch (IOException e) {
            throw new InputRejected(file, "cannot write: " + e.getMessage(), null, e);
        } finally {
            if (tmp != null) {
                try {
                    Files.deleteIfExists(tmp);
                } catch (IOException ignored) {
                    // the temporary file starts with a dot: the series reader skips it
                }
            }
        }
        return file;
    }

    /** The plan of an injection record, or null when it has none; a plan that cannot be read is refused naming the file. */
    public static InjectionPlan planOf(Sidecar.Injection injection, Path file) {
        if (injection == null || injection.plan() == null) return null;
        try {
            InjectionPlan p = STRICT.treeToValue(injection.plan(), InjectionPlan.class);
            if (p == null || p.inputs() == null)
                throw new InputRejected(file, "field 'injection.plan' has no inputs", "write it with risetrace plan --write-series");
            return p;
        } catch (JsonMappingException e) {
            String where = e.getPath().stream().map(r -> r.getFieldName() != null ? r.getFieldName() : "[" + r.getIndex() + "]")
                    .collect(Collectors.joining("."));
            Throwable root = e;
            while (root.getCause() != null) root = root.getCause();
            String why = root instanceof IllegalArgumentException ? root.getMessage() : e.getOriginalMessage();
            throw new InputRejected(file, "field 'injection.plan" + (where.isEmpty() ? "" : "." + where)
                    + "' cannot be read: " + why, "write it with risetrace plan --write-series");
        } catch (JsonProcessingException e) {
            throw new InputRejected(file, "field 'injection.plan' cannot be read: " + e.getOriginalMessage());
        }
    }
}
