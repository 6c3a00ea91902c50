package org.risetrace.calibration;

import com.fasterxml.jackson.core.JsonLocation;
import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.JsonToken;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.risetrace.frame.InputRejected;

import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Collections;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;

/**
 * The materials table: a JSON array of {@code {name, emissivity, uncertainty, source}} objects, each with an
 * optional {@code aliases} list of other names for it (short names such as "epoxy", other spellings). The table
 * bundled with the tool is {@code calibration/materials.json}; a user may load their own file.
 */
public final class Materials {
    public static final String RESOURCE = "/calibration/materials.json";

    private static final ObjectMapper JSON = org.risetrace.frame.StrictJson.builder()
            // entries are read one by one from the array's parser: the array itself follows each of them
            .disable(com.fasterxml.jackson.databind.DeserializationFeature.FAIL_ON_TRAILING_TOKENS)
            .disable(com.fasterxml.jackson.databind.DeserializationFeature.FAIL_ON_NULL_FOR_PRIMITIVES).build();
    private static volatile Materials bundled;

    private final Map<String, Material> byKey;   // normalised name or alias -> material
    private final Set<String> names;             // names and aliases as written, in file order

    private Materials(Map<String, Material> byKey, Set<String> names) {
        this.byKey = Collections.unmodifiableMap(byKey);
        this.names = Collections.unmodifiableSet(names);
    }

    /** The bundled table (read once). */
    public static Materials load() {
        Materials m = bundled;
        if (m != null) return m;
        Path pseudo = Path.of("calibration", "materials.json");
        try (InputStream in = Materials.class.getResourceAsStream(RESOURCE)) {
            if (in == null) throw new IllegalStateException("bundled resource " + RESOURCE + " missing from the build");
            m = parse(in, pseudo);
        } catch (IOException e) {
            throw new IllegalStateException("cannot read bundled " + RESOURCE, e);
        }
        bundled = m;
        return m;
    }

    /** A user's materials file; errors name the file, the line and the field. */
    public static Materials load(Path file) {
        if (!Files.exists(file)) throw new InputRejected(file, "materials file not found");
        byte[] bytes = org.risetrace.frame.InputFiles.readDocument(file, "materials file");
        try (InputStream in = new java.io.ByteArrayInputStream(bytes)) {
            return parse(in, file);
        } catch (IOException e) {
            throw new InputRejected(file, "cannot read materials file: " + e.getMessage());
        }
    }

    /** The material of that name (case-insensitive; '-', '_' and spaces count alike). */
    public Material get(String name) {
        Material m = name == null ? null : byKey.get(key(name));
        if (m == null)
            throw new InputRejected(null, "unknown material '" + name + "'", "known materials: " + String.join(", ", names));
        return m;
    }

    /** True when {@link #get} would find the name. */
    public boolean contains(String name) {
        return name != null && byKey.containsKey(key(name));
    }

    /** Every name a board file may use, as written in the table (names and their aliases), in table order. */
    public Set<String> names() {
        return names;
    }

    /** The materials themselves, once each, in table order. */
    public List<Material> materials() {
        return List.copyOf(new LinkedHashSet<>(byKey.values()));
    }

    static String key(String name) {
        return name.trim().toLowerCase(Locale.ROOT).replaceAll("[\\s_-]+", " ");
    }

    private static final List<String> FIELDS = List.of("name", "emissivity", "uncertainty", "source");
    private static final List<String> OPTIONAL = List.of("aliases");

    private static Materials parse(InputStream in, Path file) throws IOException {
        Map<String, Material> byKey = new LinkedHashMap<>();
        Set<String> names = new LinkedHashSet<>();
        try (JsonParser p = JSON.getFactory().createParser(in)) {
            if (p.nextToken() != JsonToken.START_ARRAY)
                throw new InputRejected(file, "line " + line(p.currentTokenLocation())
                        + ": a materials file is a JSON array of {name, emissivity, uncertainty, source} objects");
            while (p.nextToken() == JsonToken.START_OBJECT) {
                int line = line(p.currentTokenLocation());
                JsonNode node = JSON.readTree(p);
                Material m = material(node, file, line);
                List<String> keys = new ArrayList<>(List.of(m.name()));
                keys.addAll(aliases(node, file, line));
                for (String name : keys) {
                    if (byKey.containsKey(key(name)))
                        throw new InputRejected(file, "line " + line + ": material name '" + name
                                + "' is listed twice");
                    byKey.put(key(name), m);
                    names.add(name);
                }
            }
            if (p.currentToken() != JsonToken.END_ARRAY)
                throw new InputRejected(file, "line " + line(p.currentTokenLocation())
                        + ": each entry must be an object {name, emissivity, uncertainty, source}");
        } catch (JsonProcessingException e) {
            throw new InputRejected(file, "malformed JSON at line " + line(e.getLocation()) + ": " + e.getOriginalMessage());
        }
        if (byKey.isEmpty()) throw new InputRejected(file, "the materials file lists no materials");
        return new Materials(byKey, names);
    }

    private static List<String> aliases(JsonNode node, Path file, int line) {
        JsonNode a = node.get("aliases");
        if (a == null || a.isNull()) return List.of();
        List<String> out = new ArrayList<>();
        if (a.isArray()) for (JsonNode n : a) if (n.isTextual() && !n.asText().isBlank()) out.add(n.asText());
        if (!a.isArray() || out.size() != a.size())
            throw new InputRejected(file, "line " + line + ", field 'aliases': must be a list of names");
        return out;
    }

    /** One entry, checked field by field so that the message names the field (the entry's line is the best we know). */
    private static Material material(JsonNode node, Path file, int line) {
        for (Iterator<String> it = node.fieldNames(); it.hasNext(); ) {
            String f = it.next();
            if (!FIELDS.contains(f) && !OPTIONAL.contains(f))
                throw new InputRejected(file, "line " + line + ": unknown field '" + f + "'",
                        "fields are " + String.join(", ", FIELDS) + " and optional aliases");
        }
        for (String f : FIELDS)
            if (!node.hasNonNull(f)) throw new InputRejected(file, "line " + line + ", field '" + f + "': missing");
        if (!node.get("name").isTextual() || !node.get("source").isTextual())
            throw new InputRejected(file, "line " + line + ", fields 'name' and 'source' must be text");
        for (String f : List.of("emissivity", "uncertainty"))
            if (!node.get(f).isNumber())
                throw new InputRejected(file, "line " + line + ", field '" + f + "': must be a number, not "
                        + node.get(f));
        Material m = new Material(node.get("name").asText(), node.get("emissivity").asDouble(),
                node.get("uncertainty").asDouble(), node.get("source").asText());
        validate(m, file, line);
        return m;
    }

    private static void validate(Material m, Path file, int line) {
        if (m.name() == null || m.name().isBlank())
            throw new InputRejected(file, "line " + line + ", field 'name': missing or empty");
        String at = "line " + line + " ('" + m.name() + "'), field ";
        if (!(m.emissivity() > 0 && m.emissivity() <= 1))
            throw new InputRejected(file, at + "'emissivity': must be in (0, 1], not " + m.emissivity());
        if (!(m.uncertainty() >= 0 && m.uncertainty() < 1))
            throw new InputRejected(file, at + "'uncertainty': must be in [0, 1), not " + m.uncertainty());
        if (m.source() == null || m.source().isBlank())
            throw new InputRejected(file, at + "'source': say where the value comes from");
    }

    private static int line(JsonLocation loc) {
        return loc == null ? 0 : loc.getLineNr();
    }
}
