package org.risetrace.archive;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import org.risetrace.board.Board;
import org.risetrace.board.BoardFile;
import org.risetrace.calibration.Materials;
import org.risetrace.frame.InputRejected;
import org.risetrace.io.Series;
import org.risetrace.io.Sidecar;

import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.nio.channels.FileChannel;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.nio.file.StandardOpenOption;
import java.security.MessageDigest;
import java.sql.Connection;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.time.LocalDate;
import java.time.Year;
import java.time.ZoneOffset;
import java.time.format.DateTimeParseException;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.UUID;
import java.util.regex.Pattern;

/**
 * An open archive: the stored files ({@link ContentStore}) and the index ({@link Index}). Cases, their series and
 * files, analyses and outputs are records here; every change goes with its custody entry in one transaction.
 */
public final class Archive implements AutoCloseable {
    public static final String MARKER_FILE = "archive.json";
    public static final Pattern CASE_NUMBER = Pattern.compile("[A-Za-z0-9][A-Za-z0-9._-]{0,39}");
    public static final Pattern SERIES_NAME = Pattern.compile("[A-Za-z0-9][A-Za-z0-9._-]{0,63}");
    public static final List<String> STATUSES = List.of("open", "closed");
    static final int MAX_FIELD = 500;
    /** Files stored at once by add-series. */
    static final int STORE_THREADS = 4;
    private static final ObjectMapper JSON = new ObjectMapper();

    final ArchiveSettings settings;
    final ContentStore store;
    final Index index;
    final String who;

    /** A case as stored. */
    public record CaseRecord(String caseNumber, String customerRef, String device, String serialNumber, String fault,
                             String technician, String status, String openedAt, String closedAt) { }

    /** What the shop types for a new case; a null case number takes the next of the year (2026-0001, ...). */
    public record NewCase(String caseNumber, String customerRef, String device, String serialNumber, String fault,
                          String technician) { }

    /** A filter for listing: each part may be null; dates are opening dates, both ends included. */
    public record CaseQuery(String status, LocalDate from, LocalDate to, String text, int limit) {
        public static CaseQuery all() {
            return new CaseQuery(null, null, null, null, 10_000);
        }
    }

    /** A stored file of a series: a frame, the board file, the sidecar or the bench readings. */
    public record StoredFile(int index, String role, String fileName, String sha256, long sizeBytes, String modifiedAt) { }

    public record SeriesRecord(String caseNumber, String name, String addedAt, String addedBy, String source,
                               String injection, String notes, int fileCount, List<StoredFile> files) { }

    public record OutputRecord(long id, String caseNumber, Long analysisId, String kind, String name, String sha256,
                               long sizeBytes, String madeAt) { }

    public record AnalysisRecord(long id, String caseNumber, String seriesName, String analysedAt, String analysedBy,
                                 String toolVersion, String mode, String parameters, String verdictStatus,
                                 String verdictRef, String headline, String reason, List<OutputRecord> outputs) { }

    /** A case with everything stored for it. */
    public record CaseDetail(CaseRecord record, List<SeriesRecord> series, List<AnalysisRecord> analyses,
                             List<OutputRecord> documents, List<Custody.Entry> custody) { }

    /** The outcome of adding a series: the record and whether it was already there, identical. */
    public record Added(SeriesRecord series, boolean alreadyPresent, List<String> warnings) { }

    private Archive(ArchiveSettings settings, ContentStore store, Index index, String who) {
        this.settings = settings;
        this.store = store;
        this.index = index;
        this.who = who;
    }

    /**
     * Opens the archive, creating it when the folder does not exist or is empty: for {@code case create},
     * {@code case import} and the workbench (which opens the archive named at its start). A folder that holds
     * other things and no archive is refused: a mistyped path must not turn a user's folder into an archive.
     * {@code who} names the person for the custody log. Every other command uses {@link #openExisting}.
     */
    public static Archive open(ArchiveSettings settings, String who) {
        if (who == null || who.isBlank()) throw new IllegalArgumentException("who");
        Path folder = checkedFolder(settings);
        if (Files.exists(folder) && !Files.isDirectory(folder))
            throw new ArchiveException(folder, "not a folder", "name the archive folder with --archive");
        if (!exists(folder) && !emptyOrUnfinished(folder))
            throw new ArchiveException(folder, "this folder holds other files and no archive",
                    "name an empty or new folder for the archive with --archive");
        return openFolder(settings, who);
    }

    /**
     * Opens an archive that exists (its folder holds {@value #MARKER_FILE}); creates nothing. Refused with "no
     * archive at FOLDER" otherwise, so a mistyped path is said, not taken for an empty archive.
     */
    public static Archive openExisting(ArchiveSettings settings, String who) {
        if (who == null || who.isBlank()) throw new IllegalArgumentException("who");
        Path folder = checkedFolder(settings);
        if (!exists(folder))
            throw new ArchiveException(null, "no archive at " + folder, (emptyOrUnfinished(folder)
                    ? "'risetrace case create --archive " + folder + "' creates one there; or name yours"
                    : "the folder holds other files; name the archive folder") + " with --archive or $"
                    + ArchiveSettings.ENV_ARCHIVE);
        return openFolder(settings, who);
    }

    /** Whether {@code folder} holds an archive (its marker file, written when the archive was created). */
    public static boolean exists(Path folder) {
        return Files.isRegularFile(folder.resolve(MARKER_FILE), LinkOption.NOFOLLOW_LINKS);
    }

    private static Path checkedFolder(ArchiveSettings settings) {
        Path folder = settings.folder();
        // an empty name would put the index and files/ into the working folder
        if (folder == null || folder.toString().isBlank())
            throw new ArchiveException(null, "the archive folder is named by an empty path", "name it with --archive DIR");
        return folder;
    }

    /**
     * A folder an archive may be created in: none yet, empty, or holding only what an archive's own first opening
     * leaves before its marker is written (a kill at that moment, or another bench creating the same shared folder).
     */
    private static boolean emptyOrUnfinished(Path folder) {
        if (!Files.exists(folder, LinkOption.NOFOLLOW_LINKS)) return true;
        try (var s = Files.list(folder)) {
            return s.map(p -> p.getFileName().toString()).allMatch(n -> n.equals(ContentStore.FILES)
                    || n.equals(ContentStore.TMP) || n.startsWith(Index.SQLITE_FILE) || n.startsWith(".write-"));
        } catch (IOException e) {
            throw new ArchiveException(folder, "cannot list the folder: " + e.getMessage());
        }
    }

    private static Archive openFolder(ArchiveSettings settings, String who) {
        Path folder = settings.folder();
        try {
            Files.createDirectories(folder);
        } catch (IOException e) {
            throw new ArchiveException(folder, "cannot create the archive folder: " + e.getMessage());
        }
        ContentStore store = new ContentStore(folder);
        Index index = Index.open(settings);
        try {
            index.write(c -> {
                bind(c, folder, index.dialect());
                return null;
            });
        } catch (RuntimeException e) {
            index.close();
            throw e;
        }
        store.sweepTemporaryFiles();
        return new Archive(settings, store, index, who.strip());
    }

    /** Ties the folder and the index together, so a shared folder is never used with the wrong index. */
    private static void bind(Connection c, Path folder, Index.Dialect dialect) throws SQLException {
        String dbId = Index.meta(c, "archive_id");
        Path marker = folder.resolve(MARKER_FILE);
        String fileId = null;
        if (Files.exists(marker, LinkOption.NOFOLLOW_LINKS)) {
            try {
                fileId = JSON.readTree(Files.readString(marker)).path("archive_id").asText(null);
            } catch (IOException e) {
                throw new ArchiveException(marker, "cannot read the archive marker: " + e.getMessage());
            }
        }
        if (dbId != null && dbId.equals(fileId)) return;
        if (dbId != null && fileId != null)
            throw new ArchiveException(folder, "this archive folder belongs to another index (" + fileId + ", the index is "
                    + dbId + ")", "name the folder and the database that were set up together");
        if (dbId == null && fileId != null)
            throw new ArchiveException(folder, "this archive folder belongs to another index (" + fileId + ")",
                    "name the database it was set up with (--archive-db)");
        if (dbId == null) {
            dbId = UUID.randomUUID().toString();
            Index.setMeta(c, "archive_id", dbId);
            Index.setMeta(c, "created_at", Index.now());
        } else {
            try (var s = Files.list(folder.resolve(ContentStore.FILES).resolve("sha256"))) {
                if (s.findAny().isPresent())
                    throw new ArchiveException(folder, "this archive folder holds files but no marker for index " + dbId,
                            "name the folder that was set up with this database");
            } catch (IOException e) {
                throw new ArchiveException(folder, "cannot list the archive folder: " + e.getMessage());
            }
        }
        ObjectNode m = JSON.createObjectNode();
        m.put("archive_id", dbId);
        m.put("index", dialect == Index.Dialect.SQLITE ? "sqlite" : "postgresql");
        m.put("note", "risetrace evidence archive: change nothing here by hand; 'risetrace case verify' checks it");
        try {
            writeAtomically(marker, m.toPrettyString() + "\n");
        } catch (IOException e) {
            throw new ArchiveException(marker, "cannot write the archive marker: " + e.getMessage());
        }
    }

    static void writeAtomically(Path file, String text) throws IOException {
        Path t = Files.createTempFile(file.toAbsolutePath().getParent(), ".write-", ".part");
        try {
            try (FileChannel ch = FileChannel.open(t, StandardOpenOption.WRITE)) {
                ch.write(java.nio.ByteBuffer.wrap(text.getBytes(StandardCharsets.UTF_8)));
                ch.force(true);
            }
            Files.move(t, file, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
            ContentStore.forceFolder(file.toAbsolutePath().getParent());
        } finally {
            Files.deleteIfExists(t);
        }
    }

    public ArchiveSettings settings() { return settings; }
    public ContentStore store() { return store; }
    public Index index() { return index; }
    public String who() { return who; }

    // ---------------------------------------------------------------- cases

    public CaseRecord createCase(NewCase n) {
        String customer = field("customer reference", n.customerRef(), 100);
        String device = field("device", n.device(), MAX_FIELD);
        String serial = field("serial number", n.serialNumber(), 100);
        String fault = field("reported fault", n.fault(), MAX_FIELD);
        String tech = field("technician", n.technician() == null ? who : n.technician(), 100);
        if (n.caseNumber() != null && !CASE_NUMBER.matcher(n.caseNumber()).matches())
            throw new ArchiveException(null, "case number '" + n.caseNumber() + "' is not usable",
                    "use 1 to 40 letters, digits, '.', '_' or '-', starting with a letter or digit");
        return index.write(c -> {
            String number = n.caseNumber() != null ? n.caseNumber() : nextCaseNumber(c);
            if (caseRow(c, number) != null)
                throw new ArchiveException(null, "case " + number + " exists already", "choose another number");
            try (PreparedStatement ps = c.prepareStatement("INSERT INTO cases (case_number, customer_ref, device, "
                    + "serial_number, fault, technician, status, opened_at, closed_at) VALUES (?, ?, ?, ?, ?, ?, 'open', ?, NULL)")) {
                ps.setString(1, number);
                ps.setString(2, customer);
                ps.setString(3, device);
                ps.setString(4, serial);
                ps.setString(5, fault);
                ps.setString(6, tech);
                ps.setString(7, Index.now());
                ps.executeUpdate();
            }
            String subject = Digests.caseSubject(number);
            Custody.append(c, who, "create-case", number, subject, null, Digests.of(c, subject), null);
            return caseRow(c, number);
        });
    }

    private static String nextCaseNumber(Connection c) throws SQLException {
        String year = Year.now(ZoneOffset.UTC).toString();
        int max = 0;
        try (PreparedStatement ps = c.prepareStatement("SELECT case_number FROM cases WHERE case_number LIKE ?")) {
            ps.setString(1, year + "-%");
            try (ResultSet rs = ps.executeQuery()) {
                while (rs.next()) {
                    String tail = rs.getString(1).substring(year.length() + 1);
                    if (tail.matches("\\d{1,9}")) max = Math.max(max, Integer.parseInt(tail));
                }
            }
        }
        return String.format(Locale.ROOT, "%s-%04d", year, max + 1);
    }

    /** A one-line text field of the case: trimmed, control characters refused, at most {@code max} characters. */
    static String field(String what, String value, int max) {
        if (value == null || value.isBlank()) return null;
        String v = value.strip();
        for (int i = 0; i < v.length(); i++)
            if (Character.isISOControl(v.charAt(i)))
                throw new ArchiveException(null, "the " + what + " holds a control character (a line break or tab)",
                        "type it on one line");
        if (v.length() > max) throw new ArchiveException(null, "the " + what + " is longer than " + max + " characters");
        return v;
    }

    public void setStatus(String caseNumber, String status) {
        if (!STATUSES.contains(status))
            throw new ArchiveException(null, "status '" + status + "' is not one of " + String.join(", ", STATUSES));
        index.write(c -> {
            CaseRecord r = requireCase(c, caseNumber);
            if (r.status().equals(status)) return null;
            try (PreparedStatement ps = c.prepareStatement("UPDATE cases SET status = ?, closed_at = ? WHERE case_number = ?")) {
                ps.setString(1, status);
                ps.setString(2, status.equals("closed") ? Index.now() : null);
                ps.setString(3, caseNumber);
                ps.executeUpdate();
            }
            String subject = Digests.caseSubject(caseNumber);
            Custody.append(c, who, "set-status", caseNumber, subject, null, Digests.of(c, subject), status);
            return null;
        });
    }

    static CaseRecord caseRow(Connection c, String number) throws SQLException {
        try (PreparedStatement ps = c.prepareStatement("SELECT " + CASE_COLUMNS + " FROM cases WHERE case_number = ?")) {
            ps.setString(1, number);
            try (ResultSet rs = ps.executeQuery()) {
                return rs.next() ? caseOf(rs) : null;
            }
        }
    }

    static CaseRecord requireCase(Connection c, String number) throws SQLException {
        CaseRecord r = caseRow(c, number);
        if (r == null) throw new ArchiveException(null, "no case " + number + " in the archive", "'risetrace case list' shows them");
        return r;
    }

    private static final String CASE_COLUMNS = "case_number, customer_ref, device, serial_number, fault, technician, "
            + "status, opened_at, closed_at";

    private static CaseRecord caseOf(ResultSet rs) throws SQLException {
        return new CaseRecord(rs.getString(1), rs.getString(2), rs.getString(3), rs.getString(4), rs.getString(5),
                rs.getString(6), rs.getString(7), rs.getString(8), rs.getString(9));
    }

    /** Cases matching the query, newest first. */
    public List<CaseRecord> listCases(CaseQuery q) {
        StringBuilder sql = new StringBuilder("SELECT " + CASE_COLUMNS + " FROM cases WHERE 1 = 1");
        List<Object> args = new ArrayList<>();
        if (q.status() != null) {
            sql.append(" AND status = ?");
            args.add(q.status());
        }
        if (q.from() != null) {
            sql.append(" AND opened_at >= ?");
            args.add(q.from().toString());
        }
        if (q.to() != null) {
            sql.append(" AND opened_at < ?");
            args.add(q.to().plusDays(1).toString());
        }
        if (q.text() != null && !q.text().isBlank()) {
            String like = "%" + q.text().strip().toLowerCase(Locale.ROOT).replace("\\", "\\\\").replace("%", "\\%")
                    .replace("_", "\\_") + "%";
            sql.append(" AND (");
            String[] cols = {"case_number", "customer_ref", "device", "serial_number", "fault", "technician"};
            for (String col : cols) {
                sql.append("LOWER(").append(col).append(") LIKE ? ESCAPE '\\' OR ");
                args.add(like);
            }
            sql.append("EXISTS (SELECT 1 FROM analyses a WHERE a.case_number = cases.case_number AND "
                    + "LOWER(a.verdict_ref) LIKE ? ESCAPE '\\') OR EXISTS (SELECT 1 FROM series s WHERE "
                    + "s.case_number = cases.case_number AND LOWER(s.notes) LIKE ? ESCAPE '\\'))");
            args.add(like);
            args.add(like);
        }
        sql.append(" ORDER BY opened_at DESC, case_number LIMIT ").append(Math.max(1, q.limit()));
        return index.read(c -> {
            List<CaseRecord> out = new ArrayList<>();
            try (PreparedStatement ps = c.prepareStatement(sql.toString())) {
                for (int i = 0; i < args.size(); i++) ps.setObject(i + 1, args.get(i));
                try (ResultSet rs = ps.executeQuery()) {
                    while (rs.next()) out.add(caseOf(rs));
                }
            }
            return out;
        });
    }

    /** A date typed as YYYY-MM-DD. */
    public static LocalDate date(String s, String what) {
        try {
            return LocalDate.parse(s);
        } catch (DateTimeParseException e) {
            throw new ArchiveException(null, what + " '" + s + "' is not a date", "write it as YYYY-MM-DD");
        }
    }

    public CaseDetail show(String caseNumber) {
        return index.read(c -> detail(c, caseNumber));
    }

    static CaseDetail detail(Connection c, String caseNumber) throws SQLException {
        CaseRecord r = requireCase(c, caseNumber);
        List<SeriesRecord> series = new ArrayList<>();
        try (PreparedStatement ps = c.prepareStatement("SELECT name FROM series WHERE case_number = ? ORDER BY added_at, name")) {
            ps.setString(1, caseNumber);
            try (ResultSet rs = ps.executeQuery()) {
                List<String> names = new ArrayList<>();
                while (rs.next()) names.add(rs.getString(1));
                for (String n : names) series.add(seriesRow(c, caseNumber, n));
            }
        }
        List<AnalysisRecord> analyses = new ArrayList<>();
        try (PreparedStatement ps = c.prepareStatement("SELECT id FROM analyses WHERE case_number = ? ORDER BY id")) {
            ps.setString(1, caseNumber);
            List<Long> ids = new ArrayList<>();
            try (ResultSet rs = ps.executeQuery()) {
                while (rs.next()) ids.add(rs.getLong(1));
            }
            for (long id : ids) analyses.add(analysisRow(c, id));
        }
        List<OutputRecord> docs = outputs(c, "case_number = ? AND analysis_id IS NULL", caseNumber);
        return new CaseDetail(r, series, analyses, docs, Custody.entries(c, caseNumber));
    }

    static SeriesRecord seriesRow(Connection c, String caseNumber, String name) throws SQLException {
        try (PreparedStatement ps = c.prepareStatement("SELECT case_number, name, added_at, added_by, source, injection, "
                + "notes, file_count FROM series WHERE case_number = ? AND name = ?")) {
            ps.setString(1, caseNumber);
            ps.setString(2, name);
            try (ResultSet rs = ps.executeQuery()) {
                if (!rs.next()) return null;
                return new SeriesRecord(rs.getString(1), rs.getString(2), rs.getString(3), rs.getString(4),
                        rs.getString(5), rs.getString(6), rs.getString(7), rs.getInt(8), files(c, caseNumber, name));
            }
        }
    }

    static List<StoredFile> files(Connection c, String caseNumber, String name) throws SQLException {
        List<StoredFile> out = new ArrayList<>();
        try (PreparedStatement ps = c.prepareStatement("SELECT file_index, role, file_name, sha256, size_bytes, modified_at "
                + "FROM frames WHERE case_number = ? AND series_name = ? ORDER BY file_index")) {
            ps.setString(1, caseNumber);
            ps.setString(2, name);
            try (ResultSet rs = ps.executeQuery()) {
                while (rs.next())
                    out.add(new StoredFile(rs.getInt(1), rs.getString(2), rs.getString(3), rs.getString(4),
                            rs.getLong(5), rs.getString(6)));
            }
        }
        return out;
    }

    static AnalysisRecord analysisRow(Connection c, long id) throws SQLException {
        try (PreparedStatement ps = c.prepareStatement("SELECT id, case_number, series_name, analysed_at, analysed_by, "
                + "tool_version, mode, parameters, verdict_status, verdict_ref, headline, reason FROM analyses WHERE id = ?")) {
            ps.setLong(1, id);
            try (ResultSet rs = ps.executeQuery()) {
                if (!rs.next()) return null;
                return new AnalysisRecord(rs.getLong(1), rs.getString(2), rs.getString(3), rs.getString(4),
                        rs.getString(5), rs.getString(6), rs.getString(7), rs.getString(8), rs.getString(9),
                        rs.getString(10), rs.getString(11), rs.getString(12), outputs(c, "analysis_id = ?", id));
            }
        }
    }

    static List<OutputRecord> outputs(Connection c, String where, Object arg) throws SQLException {
        List<OutputRecord> out = new ArrayList<>();
        try (PreparedStatement ps = c.prepareStatement("SELECT id, case_number, analysis_id, kind, name, sha256, size_bytes, "
                + "made_at FROM outputs WHERE " + where + " ORDER BY id")) {
            ps.setObject(1, arg);
            try (ResultSet rs = ps.executeQuery()) {
                while (rs.next()) {
                    long a = rs.getLong(3);
                    Long analysisId = rs.wasNull() ? null : a;
                    out.add(new OutputRecord(rs.getLong(1), rs.getString(2), analysisId, rs.getString(4),
                            rs.getString(5), rs.getString(6), rs.getLong(7), rs.getString(8)));
                }
            }
        }
        return out;
    }

    public List<Custody.Entry> custody(String caseNumber) {
        return index.read(c -> Custody.entries(c, caseNumber));
    }

    // ---------------------------------------------------------------- series

    /**
     * Copies a series folder in: its frames (in the series' order), board.json ({@code boardOrNull} replaces it),
     * series.json and readings.csv when present. The files are stored first (a kill leaves at most files no record
     * names); then the series, its files and the custody entry are recorded in one transaction, so a series is in
     * the archive wholly or not at all. Adding the same files under the same name again changes nothing.
     */
    public Added addSeries(String caseNumber, Path folder, String nameOrNull, Path boardOrNull) {
        String name = nameOrNull != null ? nameOrNull : folder.toAbsolutePath().normalize().getFileName().toString();
        if (!SERIES_NAME.matcher(name).matches())
            throw new ArchiveException(folder, "series name '" + name + "' is not usable",
                    "name it with --name: 1 to 64 letters, digits, '.', '_' or '-'");
        index.read(c -> requireCase(c, caseNumber));
        Series s = Series.open(folder);
        List<Path> sources = new ArrayList<>();
        List<String> roles = new ArrayList<>();
        for (Path f : s.files()) {
            sources.add(f);
            roles.add("frame");
        }
        Path board = boardOrNull != null ? boardOrNull : folder.resolve("board.json");
        if (Files.exists(board, LinkOption.NOFOLLOW_LINKS)) {
            sources.add(board);
            roles.add("board");
        } else if (boardOrNull != null) {
            throw new ArchiveException(board, "board file not found");
        }
        for (String[] extra : new String[][]{{"series.json", "sidecar"}, {Series.BENCH_READINGS_FILE, "readings"}}) {
            Path p = folder.resolve(extra[0]);
            if (Files.exists(p, LinkOption.NOFOLLOW_LINKS)) {
                sources.add(p);
                roles.add(extra[1]);
            }
        }
        for (Path p : sources) {
            if (!Files.isRegularFile(p, LinkOption.NOFOLLOW_LINKS))
                throw new ArchiveException(p, "not a regular file (a link, folder or device)", "copy the file itself in");
            // checked before anything is stored: a file that cannot be read halfway through would leave the files
            // stored before it behind, named by no record
            if (!Files.isReadable(p)) throw new ArchiveException(p, "cannot read the file (no permission)");
        }
        // an archived original never changes and a taken series name refuses other files, so a board the analysis
        // cannot read would stay in the case for good: common practice, evidence stores only what can be analysed
        if (roles.contains("board")) checkBoard(board, s);
        // the series name is taken: decide from the files' hashes before storing anything, so a refusal leaves no
        // stored file behind (hashing twice costs only here; a new name, the usual case, hashes once, while storing)
        SeriesRecord taken = index.read(c -> seriesRow(c, caseNumber, name));
        if (taken != null) {
            List<StoredFile> planned = new ArrayList<>();
            for (int k = 0; k < sources.size(); k++) {
                Path p = sources.get(k);
                try {
                    planned.add(new StoredFile(k, roles.get(k), storedName(p, roles.get(k)), Hashes.of(p), Files.size(p), null));
                } catch (IOException e) {
                    throw new ArchiveException(p, "cannot read the file: " + e.getMessage(), null, e);
                }
            }
            if (sameFiles(taken.files(), planned)) return new Added(taken, true, s.warnings());
            throw nameTaken(folder, caseNumber, name);
        }
        // the files are stored by a few threads at once: one file's fsync overlaps the next one's hashing
        StoredFile[] done = new StoredFile[sources.size()];
        java.util.concurrent.ExecutorService pool = java.util.concurrent.Executors.newFixedThreadPool(
                Math.max(1, Math.min(STORE_THREADS, sources.size())));
        try {
            List<java.util.concurrent.Future<?>> futures = new ArrayList<>();
            for (int i = 0; i < sources.size(); i++) {
                int k = i;
                futures.add(pool.submit(() -> {
                    Path p = sources.get(k);
                    String fileName = storedName(p, roles.get(k));
                    try {
                        String modified = Index.time(Files.getLastModifiedTime(p, LinkOption.NOFOLLOW_LINKS).toInstant());
                        ContentStore.Stored st = store.put(p, null);
                        done[k] = new StoredFile(k, roles.get(k), fileName, st.sha256(), st.sizeBytes(), modified);
                    } catch (IOException e) {
                        throw new ArchiveException(p, "cannot store the file: " + e.getMessage(), null, e);
                    }
                    return null;
                }));
            }
            for (java.util.concurrent.Future<?> f : futures) {
                try {
                    f.get();
                } catch (java.util.concurrent.ExecutionException e) {
                    if (e.getCause() instanceof RuntimeException re) throw re;
                    throw new IllegalStateException(e.getCause());
                } catch (InterruptedException e) {
                    Thread.currentThread().interrupt();
                    throw new ArchiveException(folder, "interrupted while storing the series");
                }
            }
        } finally {
            pool.shutdownNow();
        }
        List<StoredFile> stored = List.of(done);
        StringBuilder listing = new StringBuilder();
        for (StoredFile f : stored) listing.append(f.sha256()).append("  ").append(f.fileName()).append('\n');
        Sidecar sc = s.sidecar();
        String injection = null;
        if (sc != null && sc.injection() != null) injection = JSON.valueToTree(sc.injection()).toString();
        String notes = sc == null ? null : sc.notes();
        String source = folder.toAbsolutePath().normalize().toString();
        String manifestSha = Hashes.of(listing.toString());
        String finalInjection = injection;
        return index.write(c -> {
            requireCase(c, caseNumber);
            SeriesRecord existing = seriesRow(c, caseNumber, name);
            if (existing != null) {
                if (sameFiles(existing.files(), stored)) return new Added(existing, true, s.warnings());
                // only when another bench took the name since the check above: the files just stored stay, named by
                // no record (a note of 'case verify', as after a kill); deleting them here could take a file from
                // under a third bench that stored the same bytes a moment ago and is about to record them
                throw nameTaken(folder, caseNumber, name);
            }
            insertSeries(c, new SeriesRecord(caseNumber, name, Index.now(), who, source, finalInjection, notes,
                    stored.size(), stored));
            String subject = Digests.seriesSubject(caseNumber, name);
            Custody.append(c, who, "add-series", caseNumber, subject, manifestSha, Digests.of(c, subject),
                    stored.size() + " files from " + source);
            return new Added(seriesRow(c, caseNumber, name), false, s.warnings());
        });
    }

    /** The name a series file is stored under: the board file is always board.json, as analysis looks for it. */
    private static String storedName(Path p, String role) {
        return role.equals("board") ? "board.json" : p.getFileName().toString();
    }

    private static ArchiveException nameTaken(Path folder, String caseNumber, String name) {
        return new ArchiveException(folder, "case " + caseNumber + " has a series '" + name + "' with other files",
                "add it under another name with --name");
    }

    /**
     * Reads the board file as {@code case analyse} will (the materials table, the outline, the frame the outline
     * was marked on), so a series goes in only with a board it can be analysed against. The message names the
     * user's file, never a copy.
     */
    private static void checkBoard(Path board, Series s) {
        String hint = "nothing was stored; correct the board file ('risetrace board check' checks it) and add the series again";
        Board b;
        try {
            b = BoardFile.read(board, Materials.load().names());
        } catch (InputRejected e) {
            throw new ArchiveException(board, "the board file cannot be analysed: " + e.reason(),
                    e.hint() == null ? hint : e.hint() + "; " + hint, e);
        }
        // analysis aligns every frame to the one the outline was marked on (SeriesAnalyzer.referenceIndex), so that
        // frame must be one of the series'
        String ref = b.outline() == null ? null : b.outline().frame();
        if (ref == null || ref.isBlank()) return;
        for (int i = 0; i < s.size(); i++) if (s.fileName(i).equals(ref)) return;
        throw new ArchiveException(board, "the board file cannot be analysed: the outline is marked on frame '" + ref
                + "', which is not in the series", "mark the outline on a frame of this series (risetrace board); " + hint);
    }

    static void insertSeries(Connection c, SeriesRecord r) throws SQLException {
        try (PreparedStatement ps = c.prepareStatement("INSERT INTO series (case_number, name, added_at, added_by, source, "
                + "injection, notes, file_count) VALUES (?, ?, ?, ?, ?, ?, ?, ?)")) {
            ps.setString(1, r.caseNumber());
            ps.setString(2, r.name());
            ps.setString(3, r.addedAt());
            ps.setString(4, r.addedBy());
            ps.setString(5, r.source());
            ps.setString(6, r.injection());
            ps.setString(7, r.notes());
            ps.setInt(8, r.fileCount());
            ps.executeUpdate();
        }
        try (PreparedStatement ps = c.prepareStatement("INSERT INTO frames (case_number, series_name, file_index, role, "
                + "file_name, sha256, size_bytes, modified_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?)")) {
            for (StoredFile f : r.files()) {
                ps.setString(1, r.caseNumber());
                ps.setString(2, r.name());
                ps.setInt(3, f.index());
                ps.setString(4, f.role());
                ps.setString(5, f.fileName());
                ps.setString(6, f.sha256());
                ps.setLong(7, f.sizeBytes());
                ps.setString(8, f.modifiedAt());
                ps.addBatch();
            }
            ps.executeBatch();
        }
    }

    private static boolean sameFiles(List<StoredFile> a, List<StoredFile> b) {
        if (a.size() != b.size()) return false;
        for (int i = 0; i < a.size(); i++)
            if (!a.get(i).fileName().equals(b.get(i).fileName()) || !a.get(i).sha256().equals(b.get(i).sha256())
                    || !a.get(i).role().equals(b.get(i).role())) return false;
        return true;
    }

    public SeriesRecord series(String caseNumber, String name) {
        return index.read(c -> {
            requireCase(c, caseNumber);
            SeriesRecord r = seriesRow(c, caseNumber, name);
            if (r == null) throw new ArchiveException(null, "case " + caseNumber + " has no series '" + name + "'",
                    "'risetrace case show " + caseNumber + "' lists its series");
            return r;
        });
    }

    /**
     * Copies a stored file to {@code target}, checking its SHA-256 on the way: a damaged original is never handed
     * on (to an analysis or a bag) as if it were whole.
     */
    void copyOut(String sha256, Path target, String what) {
        Path src = store.path(sha256);
        MessageDigest md = Hashes.sha256();
        try (InputStream in = Files.newInputStream(src, LinkOption.NOFOLLOW_LINKS);
             OutputStream out = Files.newOutputStream(target, StandardOpenOption.CREATE_NEW, StandardOpenOption.WRITE)) {
            byte[] buf = new byte[Hashes.BUFFER];
            for (int n; (n = in.read(buf)) > 0; ) {
                md.update(buf, 0, n);
                out.write(buf, 0, n);
            }
        } catch (IOException e) {
            throw new ArchiveException(src, "cannot read the stored " + what + ": " + e.getMessage(), "run 'risetrace case verify'", e);
        }
        if (!Hashes.hex(md.digest()).equals(sha256))
            throw new ArchiveException(src, "the stored " + what + " no longer has its SHA-256", "run 'risetrace case verify'");
    }

    /** A file name without a folder: no '/', '\\', control character, and not '.' or '..'. */
    static boolean plainName(String n) {
        if (n == null || n.isEmpty() || n.length() > 255 || n.equals(".") || n.equals("..")) return false;
        for (int i = 0; i < n.length(); i++) {
            char ch = n.charAt(i);
            if (ch == '/' || ch == '\\' || Character.isISOControl(ch)) return false;
        }
        return true;
    }

    /** Writes a stored series into {@code dir} under the original file names (each checked on the way). */
    Path materialise(SeriesRecord s, Path dir) throws IOException {
        Path folder = Files.createDirectories(dir.resolve(s.name()));
        for (StoredFile f : s.files()) {
            if (!plainName(f.fileName())) throw new ArchiveException(null, "stored file name '" + f.fileName() + "' is not plain");
            copyOut(f.sha256(), folder.resolve(f.fileName()), f.fileName());
        }
        return folder;
    }

    /** Stores a made file and records it as an output of the case (and of an analysis when non-null), logged. */
    OutputRecord recordOutput(Connection c, String caseNumber, Long analysisId, String kind, String name,
                              ContentStore.Stored st, boolean log) throws SQLException {
        return recordOutput(c, caseNumber, analysisId, kind, name, st, null, log ? kind : null, name);
    }

    /**
     * As above, with the time it was made ({@code madeAt}; null: now) and the custody action and detail to log
     * (action null: not logged): an import keeps an output's own date and logs it as imported, not as made now.
     */
    OutputRecord recordOutput(Connection c, String caseNumber, Long analysisId, String kind, String name,
                              ContentStore.Stored st, String madeAt, String action, String detail) throws SQLException {
        long id = Index.next(c, "outputs", "id");
        try (PreparedStatement ps = c.prepareStatement("INSERT INTO outputs (id, case_number, analysis_id, kind, name, "
                + "sha256, size_bytes, made_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?)")) {
            ps.setLong(1, id);
            ps.setString(2, caseNumber);
            if (analysisId == null) ps.setNull(3, java.sql.Types.BIGINT);
            else ps.setLong(3, analysisId);
            ps.setString(4, kind);
            ps.setString(5, name);
            ps.setString(6, st.sha256());
            ps.setLong(7, st.sizeBytes());
            ps.setString(8, madeAt != null ? madeAt : Index.now());
            ps.executeUpdate();
        }
        if (action != null) {
            String subject = Digests.outputSubject(id);
            Custody.append(c, who, action, caseNumber, subject, st.sha256(), Digests.of(c, subject), detail);
        }
        return outputs(c, "id = ?", id).get(0);
    }

    /** Appends a custody entry for an action that changes no record (export, verification). */
    void log(String action, String caseNumber, String subject, String sha256, String detail) {
        index.write(c -> Custody.append(c, who, action, caseNumber, subject, sha256, null, detail));
    }

    static Map<String, Object> jsonMap(String json) {
        try {
            @SuppressWarnings("unchecked")
            Map<String, Object> m = JSON.readValue(json, Map.class);
            return m;
        } catch (IOException e) {
            return Map.of();
        }
    }

    @Override
    public void close() {
        index.close();
    }
}
