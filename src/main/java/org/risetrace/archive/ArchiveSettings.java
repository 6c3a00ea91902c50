package org.risetrace.archive;

import java.io.IOException;
import java.io.Reader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.Map;
import java.util.Properties;

/**
 * Where an archive lives: its folder (the stored files; with SQLite also the index) and, for a shop with several
 * benches, the JDBC address of a shared PostgreSQL server. Credentials come from the environment
 * ({@value #ENV_DB_USER}, {@value #ENV_DB_PASSWORD}) or a properties file ({@code user=}, {@code password=}), never
 * from the command line: a password there would stand in the shell history and the process list.
 *
 * @param folder   the archive folder
 * @param dbUrl    {@code jdbc:postgresql://...}, or null for the SQLite index in the folder
 * @param user     database user (PostgreSQL only)
 * @param password database password (PostgreSQL only)
 */
public record ArchiveSettings(Path folder, String dbUrl, String user, String password) {
    public static final String ENV_ARCHIVE = "RISETRACE_ARCHIVE";
    public static final String ENV_DB = "RISETRACE_ARCHIVE_DB";
    public static final String ENV_DB_USER = "RISETRACE_ARCHIVE_DB_USER";
    public static final String ENV_DB_PASSWORD = "RISETRACE_ARCHIVE_DB_PASSWORD";
    public static final String DB_CONFIG_FILE = "archive-db.properties";

    @Override
    public String toString() {
        return "ArchiveSettings[" + folder + ", " + (dbUrl == null ? "sqlite" : dbUrl) + "]"; // never the password
    }

    public static ArchiveSettings sqlite(Path folder) {
        return new ArchiveSettings(folder, null, null, null);
    }

    public boolean postgres() {
        return dbUrl != null;
    }

    /**
     * Settings from the command line's choices (each may be null) and the environment: the folder from
     * {@code folder}, else {@value #ENV_ARCHIVE}, else the user's data folder ({@code $XDG_DATA_HOME/risetrace/archive},
     * by default {@code ~/.local/share/risetrace/archive}); the database from {@code dbUrl}, else {@value #ENV_DB},
     * else SQLite; PostgreSQL credentials from the environment, else {@code dbConfig}, else
     * {@code $XDG_CONFIG_HOME/risetrace/archive-db.properties} when it exists.
     */
    public static ArchiveSettings resolve(Path folder, String dbUrl, Path dbConfig, Map<String, String> env) {
        Path dir = folder != null ? folder : env.get(ENV_ARCHIVE) != null && !env.get(ENV_ARCHIVE).isBlank()
                ? Path.of(env.get(ENV_ARCHIVE)) : defaultFolder(env);
        String url = dbUrl != null ? dbUrl : blankToNull(env.get(ENV_DB));
        if (url == null) return new ArchiveSettings(dir, null, null, null);
        if (!url.startsWith("jdbc:postgresql://"))
            throw new ArchiveException(null, "the archive database must be a jdbc:postgresql://host/name address, got '"
                    + url + "'", "leave it out for the SQLite index in the archive folder");
        String lower = url.toLowerCase(Locale.ROOT);
        if (lower.contains("password=") || lower.contains("user=") || url.substring("jdbc:postgresql://".length())
                .split("/", 2)[0].contains("@"))
            throw new ArchiveException(null, "the database address carries credentials",
                    "put them in " + ENV_DB_USER + " and " + ENV_DB_PASSWORD + " or in " + DB_CONFIG_FILE
                            + ", never on the command line");
        String user = blankToNull(env.get(ENV_DB_USER)), password = env.get(ENV_DB_PASSWORD);
        if (user == null) {
            Path file = dbConfig != null ? dbConfig : configFolder(env).resolve(DB_CONFIG_FILE);
            if (dbConfig != null || Files.isRegularFile(file)) {
                Properties p = new Properties();
                try (Reader r = Files.newBufferedReader(file, StandardCharsets.UTF_8)) {
                    p.load(r);
                } catch (IOException e) {
                    throw new ArchiveException(file, "cannot read the database settings: " + e.getMessage());
                }
                user = blankToNull(p.getProperty("user"));
                password = p.getProperty("password");
                if (user == null) throw new ArchiveException(file, "no user= line");
            }
        }
        if (user == null)
            throw new ArchiveException(null, "no database user for " + url, "set " + ENV_DB_USER + " and "
                    + ENV_DB_PASSWORD + ", or write user= and password= into " + configFolder(env).resolve(DB_CONFIG_FILE));
        return new ArchiveSettings(dir, url, user, password);
    }

    static Path defaultFolder(Map<String, String> env) {
        String data = blankToNull(env.get("XDG_DATA_HOME"));
        Path base = data != null ? Path.of(data) : Path.of(System.getProperty("user.home"), ".local", "share");
        return base.resolve("risetrace").resolve("archive");
    }

    static Path configFolder(Map<String, String> env) {
        String c = blankToNull(env.get("XDG_CONFIG_HOME"));
        return (c != null ? Path.of(c) : Path.of(System.getProperty("user.home"), ".config")).resolve("risetrace");
    }

    private static String blankToNull(String s) {
        return s == null || s.isBlank() ? null : s.trim();
    }
}
