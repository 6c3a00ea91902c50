package org.risetrace.archive;

import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.core.JsonLocation;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonMappingException;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.exc.UnrecognizedPropertyException;
import org.risetrace.frame.InputFiles;
import org.risetrace.frame.InputRejected;
import org.risetrace.frame.JsonFieldLocation;
import org.risetrace.frame.StrictJson;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;

/**
 * The shop as its customer reports name it, from {@code shop.json}:
 * <pre>{ "name": "Bench Nine Repairs", "contact": ["12 Mill Lane", "+00 555 0100", "bench9@example.org"] }</pre>
 * Looked up as {@code --shop FILE}, else {@code shop.json} in the archive folder (shared by every bench), else
 * {@code $XDG_CONFIG_HOME/risetrace/shop.json}.
 */
public record Shop(@JsonProperty("name") String name, @JsonProperty("contact") List<String> contact) {
    public static final String FILE_NAME = "shop.json";
    // the strict rules of every user file (a key given twice refused, no coercion), as the board file and series.json
    private static final ObjectMapper JSON = StrictJson.builder()
            .enable(DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES).build();
    private static final String FORM = "write {\"name\": \"...\", \"contact\": [\"address\", \"phone\"]}";

    public static Shop load(Path explicit, Path archiveFolder, Map<String, String> env) {
        Path file = explicit;
        if (file == null) {
            Path inArchive = archiveFolder.resolve(FILE_NAME);
            Path inConfig = ArchiveSettings.configFolder(env).resolve(FILE_NAME);
            file = Files.isRegularFile(inArchive) ? inArchive : Files.isRegularFile(inConfig) ? inConfig : null;
            if (file == null)
                throw new ArchiveException(inArchive, "no shop details for the customer report",
                        "write {\"name\": \"...\", \"contact\": [\"address\", \"phone\"]} there or pass --shop FILE");
        }
        Shop s;
        byte[] json;
        try {
            json = InputFiles.readDocument(file, "shop file");
        } catch (InputRejected e) { // not found, a folder, no permission, too large: said in plain words
            throw new ArchiveException(file, "cannot read the shop details: " + e.reason(), e.hint(), e);
        }
        try {
            s = JSON.readValue(json, Shop.class);
        } catch (UnrecognizedPropertyException e) {
            String where = JsonFieldLocation.of(json, e.getPropertyName());
            throw new ArchiveException(file, "unknown field '" + e.getPropertyName() + "'"
                    + (where.isEmpty() ? at(e.getLocation()) : where), "the shop file has \"name\" and \"contact\"");
        } catch (JsonProcessingException e) {
            // the library's own words name its classes ("Cannot construct instance of `java.util.ArrayList`"): the
            // user reads the field, where it is and what was expected
            String dup = StrictJson.duplicateKey(e);
            if (dup != null) throw new ArchiveException(file, dup, "give each field once");
            String field = e instanceof JsonMappingException m && !m.getPath().isEmpty() ? fieldOf(m) : null;
            String hint = "contact".equals(field) ? "\"contact\" is a list of lines: [\"address\", \"phone\"]" : FORM;
            throw new ArchiveException(file, (field == null ? "malformed JSON" : "wrong type in field '" + field + "'")
                    + at(e.getLocation()) + ": " + StrictJson.plainProblem(e), hint);
        } catch (IOException e) {
            throw new ArchiveException(file, "cannot read the shop details: " + e.getMessage(), null, e);
        }
        if (s == null || s.name() == null || s.name().isBlank())
            throw new ArchiveException(file, "no \"name\": the shop's name heads every customer report", FORM);
        try {
            Archive.field("shop name", s.name(), 200);
            if (s.contact() != null) for (String c : s.contact()) Archive.field("shop contact line", c, 200);
        } catch (ArchiveException e) { // the field's problem, said of this file
            throw new ArchiveException(file, e.reason(), e.hint());
        }
        return s;
    }

    private static String at(JsonLocation loc) {
        return loc == null || loc.getLineNr() < 0 ? "" : " at line " + loc.getLineNr() + ", column " + loc.getColumnNr();
    }

    /** The field's path: name, contact or contact[1]. */
    private static String fieldOf(JsonMappingException e) {
        StringBuilder sb = new StringBuilder();
        for (JsonMappingException.Reference r : e.getPath()) {
            if (r.getFieldName() != null) sb.append(sb.length() == 0 ? "" : ".").append(r.getFieldName());
            else if (r.getIndex() >= 0) sb.append('[').append(r.getIndex()).append(']');
        }
        return sb.toString();
    }
}
