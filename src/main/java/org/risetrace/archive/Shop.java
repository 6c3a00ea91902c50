package org.risetrace.archive;

import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.annotation.JsonProperty;

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
    private static final ObjectMapper JSON = new ObjectMapper().enable(DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES);

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
        try {
            s = JSON.readValue(Files.readAllBytes(file), Shop.class);
        } catch (IOException e) {
            throw new ArchiveException(file, "cannot read the shop details: " + e.getMessage().split("\n")[0]);
        }
        if (s == null || s.name() == null || s.name().isBlank()) throw new ArchiveException(file, "no \"name\"");
        Archive.field("shop name", s.name(), 200);
        if (s.contact() != null) for (String c : s.contact()) Archive.field("shop contact line", c, 200);
        return s;
    }
}
