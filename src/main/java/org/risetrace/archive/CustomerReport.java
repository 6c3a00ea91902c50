package org.risetrace.archive;

import static org.risetrace.report.Html.esc;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.risetrace.report.ReportHtml;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.time.LocalDate;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * The customer report of a case: one self-contained HTML page (styles inline, images as data URIs, no script) with
 * the shop's header, the case, the findings of each series' latest analysis in plain words, that analysis' maps and
 * curves (taken from its stored report.html, so the customer sees exactly what was archived), the evidence's
 * SHA-256s, and the safety cautions. A print stylesheet lays it out on A4 or US Letter. The page is stored with the
 * case as a document and logged.
 */
public final class CustomerReport {
    public static final String FILE_NAME = "customer-report.html";
    /** Paper for the print stylesheet. */
    public enum Paper { A4, LETTER }

    private static final ObjectMapper JSON = new ObjectMapper();
    private static final Pattern FIGURE = Pattern.compile("<figure><img alt=\"([^\"]*)\"[^>]*></figure>|<figure>.*?</figure>",
            Pattern.DOTALL);
    private static final Pattern ALT = Pattern.compile("<img alt=\"([^\"]*)\"");

    private CustomerReport() { }

    /** Makes, stores and logs the report; returns its record and its text. */
    public static Made make(Archive a, String caseNumber, Shop shop, Paper paper) {
        String html = render(a, caseNumber, shop, paper);
        return new Made(store(a, caseNumber, html), html);
    }

    /** The report's page; nothing is stored or logged (the CLI writes the file first, then {@link #store}s it). */
    public static String render(Archive a, String caseNumber, Shop shop, Paper paper) {
        return html(a, a.show(caseNumber), shop, paper);
    }

    /** Stores a page made by {@link #render} with the case, as a document, and logs it. */
    public static Archive.OutputRecord store(Archive a, String caseNumber, String html) {
        byte[] bytes = html.getBytes(StandardCharsets.UTF_8);
        try {
            ContentStore.Stored st = a.store.put(new java.io.ByteArrayInputStream(bytes), null, null);
            return a.index.write(c -> a.recordOutput(c, caseNumber, null, "customer-report", FILE_NAME, st, true));
        } catch (IOException e) {
            throw new ArchiveException(a.settings.folder(), "cannot store the customer report: " + e.getMessage(), null, e);
        }
    }

    /** The stored record and the page. */
    public record Made(Archive.OutputRecord record, String html) { }

    static String html(Archive a, Archive.CaseDetail d, Shop shop, Paper paper) {
        Archive.CaseRecord r = d.record();
        StringBuilder h = new StringBuilder(1 << 20);
        h.append("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n")
                .append("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n")
                .append("<title>").append(esc("Inspection report, case " + r.caseNumber())).append("</title>\n<style>\n")
                .append(css(paper)).append("</style>\n</head>\n<body>\n<main>\n");
        h.append("<header class=\"shop\"><div class=\"shop-name\">").append(esc(shop.name())).append("</div>");
        if (shop.contact() != null && !shop.contact().isEmpty()) {
            h.append("<div class=\"shop-contact\">");
            for (int i = 0; i < shop.contact().size(); i++)
                h.append(i == 0 ? "" : " &middot; ").append(esc(shop.contact().get(i)));
            h.append("</div>");
        }
        h.append("</header>\n");
        h.append("<h1>Thermal inspection report</h1>\n<dl class=\"case\">\n");
        fact(h, "Case", r.caseNumber());
        fact(h, "Report date", LocalDate.now(ZoneOffset.UTC).toString());
        fact(h, "Your reference", r.customerRef());
        fact(h, "Device", r.device());
        fact(h, "Serial number", r.serialNumber());
        fact(h, "Fault reported", r.fault());
        fact(h, "Technician", r.technician());
        fact(h, "Case opened", r.openedAt() == null ? null : r.openedAt().substring(0, 10));
        h.append("</dl>\n");

        // the latest analysis of each series
        Map<String, Archive.AnalysisRecord> latest = new LinkedHashMap<>();
        for (Archive.AnalysisRecord an : d.analyses()) latest.put(an.seriesName(), an);
        h.append("<section class=\"findings\"><h2>What we found</h2>\n");
        if (latest.isEmpty()) h.append("<p>No measurement of this case has been analysed yet.</p>\n");
        for (Archive.SeriesRecord s : d.series()) {
            Archive.AnalysisRecord an = latest.get(s.name());
            long frames = s.files().stream().filter(f -> f.role().equals("frame")).count();
            h.append("<div class=\"finding status-").append(esc(an == null ? "none" : String.valueOf(an.verdictStatus())
                    .replace(' ', '-'))).append("\">\n<h3>Measurement ").append(esc(s.name())).append("</h3>\n");
            String injection = injectionWords(s.injection());
            h.append("<p class=\"how\">").append(frames).append(" thermal images taken ")
                    .append(injection == null ? "while the board was powered for the test" : esc(injection))
                    .append("; added to this case on ").append(esc(s.addedAt().substring(0, 10))).append(".</p>\n");
            if (an == null) {
                h.append("<p>Not analysed yet.</p>\n</div>\n");
                continue;
            }
            h.append("<p class=\"plain\">").append(esc(plainWords(an))).append("</p>\n");
            h.append("<p class=\"detail\">Measured: ").append(esc(an.headline())).append(".</p>\n");
            for (String fig : figures(a, an)) h.append(fig).append('\n');
            h.append("</div>\n");
        }
        h.append("</section>\n");

        h.append("<section class=\"evidence\"><h2>Evidence kept</h2>\n<p>The original camera files are kept unchanged "
                + "in our archive under their SHA-256 checksums, with a log of who handled them and when. The checksums "
                + "below identify the analysis each finding comes from.</p>\n<table><thead><tr><th>Measurement</th>"
                + "<th>Images</th><th>Analysed</th><th>Analysis record (SHA-256)</th></tr></thead><tbody>\n");
        for (Archive.SeriesRecord s : d.series()) {
            Archive.AnalysisRecord an = latest.get(s.name());
            String sha = an == null ? "" : an.outputs().stream().filter(o -> o.name().equals("analysis.json"))
                    .map(Archive.OutputRecord::sha256).findFirst().orElse("");
            h.append("<tr><td>").append(esc(s.name())).append("</td><td>")
                    .append(s.files().stream().filter(f -> f.role().equals("frame")).count()).append("</td><td>")
                    .append(an == null ? "not yet" : esc(an.analysedAt().substring(0, 10) + " by " + an.analysedBy()
                            + " (risetrace " + an.toolVersion() + ")"))
                    .append("</td><td class=\"hash\">").append(esc(sha)).append("</td></tr>\n");
        }
        h.append("</tbody></table>\n</section>\n");
        h.append("<aside class=\"safety\"><h2>Safety</h2><p>").append(esc(ReportHtml.SAFETY_TEXT)).append("</p></aside>\n");
        h.append("<footer>").append(esc(shop.name())).append(", case ").append(esc(r.caseNumber()))
                .append(". Made with risetrace from the archived measurements.</footer>\n");
        h.append("</main>\n</body>\n</html>\n");
        return h.toString();
    }

    /** The finding as a customer reads it. */
    static String plainWords(Archive.AnalysisRecord an) {
        String status = an.verdictStatus() == null ? "" : an.verdictStatus().toLowerCase(Locale.ROOT);
        if (status.startsWith("identified") && an.verdictRef() != null) {
            String what = switch (an.mode() == null ? "" : an.mode()) {
                case "lock-in" -> " warmed and cooled in step with the test current, which was switched on and off,"
                        + " more strongly than every other part.";
                case "compare" -> " warmed more than every other part between an image taken before and one taken"
                        + " while a limited current was fed into the board.";
                default -> " warmed up faster than every other part while a limited current was fed into the board.";
            };
            return "The part marked " + an.verdictRef() + what + " That points to " + an.verdictRef()
                    + " as the part that draws the fault current; we recommend replacing it and testing the board again.";
        }
        if (status.startsWith("no"))
            return "No part warmed measurably while current was fed into the board, so this measurement does not "
                    + "point to a failed part.";
        // the technical reason stands in the "Measured:" line below; the customer reads what it means
        return "The measurement does not single out one part with enough certainty. Further tests are needed before "
                + "a part is replaced.";
    }

    /** "with 1.0 V fed from VCORE to GND, current limited to 2 A" from the series' injection record. */
    static String injectionWords(String injectionJson) {
        if (injectionJson == null) return null;
        try {
            JsonNode n = JSON.readTree(injectionJson);
            StringBuilder sb = new StringBuilder("while a limited current was fed into the board");
            if (n.hasNonNull("from_rail") && n.hasNonNull("to_rail"))
                sb.append(" between ").append(n.get("from_rail").asText()).append(" and ").append(n.get("to_rail").asText());
            if (n.hasNonNull("volts")) sb.append(String.format(Locale.ROOT, " at %.3g V", n.get("volts").asDouble()));
            if (n.hasNonNull("current_limit_a"))
                sb.append(String.format(Locale.ROOT, ", limited to %.3g A", n.get("current_limit_a").asDouble()));
            return sb.toString();
        } catch (IOException e) {
            return null;
        }
    }

    /** The maps and curves of the analysis' stored report.html (the rise map and curves, or the lock-in maps). */
    static List<String> figures(Archive a, Archive.AnalysisRecord an) {
        List<String> out = new ArrayList<>();
        Archive.OutputRecord report = an.outputs().stream().filter(o -> o.name().equals("report.html")).findFirst().orElse(null);
        if (report == null) return out;
        String html;
        try {
            byte[] b = Files.readAllBytes(a.store.path(report.sha256()));
            if (!Hashes.of(b).equals(report.sha256()))
                throw new ArchiveException(a.store.path(report.sha256()), "the stored report no longer has its SHA-256",
                        "run 'risetrace case verify'");
            html = new String(b, StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new ArchiveException(a.store.path(report.sha256()), "cannot read the stored report: " + e.getMessage());
        }
        Matcher m = FIGURE.matcher(html);
        List<String> all = new ArrayList<>();
        while (m.find()) all.add(m.group());
        // a lock-in report carries the steady report of the same frames after its own: its rise map and curves show
        // what the lock-in looked past (noise, for a source that heats in pulses), not the finding
        boolean lockIn = "lock-in".equals(an.mode());
        for (String f : all) {
            Matcher alt = ALT.matcher(f);
            String name = alt.find() ? alt.group(1) : "";
            if (lockIn && !name.startsWith("Lock-in")) continue;
            String caption = switch (name) {
                case "Rise map" -> "How much each point of the board warmed during the test, seen from above: the "
                        + "brighter, the warmer. The outlines are the board's parts; rings mark the warmest spots.";
                case "Rise curves" -> "How fast the leading parts warmed: temperature rise over time for each.";
                default -> name.startsWith("Lock-in amplitude") ? "How strongly each point of the board warmed and "
                        + "cooled in step with the switched test current: the brighter, the stronger." : null;
            };
            if (caption != null)
                out.add(f.replaceFirst("(?s)<figcaption>.*?</figcaption>", "<figcaption>" + esc(caption) + "</figcaption>"));
        }
        if (out.isEmpty()) out.addAll(all.subList(0, Math.min(2, all.size())));
        return out;
    }

    private static void fact(StringBuilder h, String term, String value) {
        if (value == null || value.isBlank()) return;
        h.append("<div><dt>").append(esc(term)).append("</dt><dd>").append(esc(value)).append("</dd></div>\n");
    }

    static String css(Paper paper) {
        // @page sizes from CSS Paged Media Level 3 ("A4" is 210 x 297 mm, "letter" 8.5 x 11 in); the margins leave
        // the same text width on both, so one layout serves either paper
        String size = paper == Paper.LETTER ? "letter" : "A4";
        return String.join("\n",
                ":root { --ink: #1d2329; --muted: #5b6670; --rule: #d5dade; --tint: #f3f5f7; }",
                "body { margin: 0; background: #fff; color: var(--ink); font: 15px/1.45 \"DejaVu Sans\", \"Liberation Sans\", Arial, sans-serif; }",
                "main { max-width: 820px; margin: 0 auto; padding: 24px 22px 40px; }",
                "header.shop { display: flex; flex-wrap: wrap; justify-content: space-between; align-items: baseline; "
                        + "border-bottom: 3px solid var(--ink); padding-bottom: 6px; }",
                ".shop-name { font-size: 22px; font-weight: bold; }",
                ".shop-contact { color: var(--muted); font-size: 13px; }",
                "h1 { font-size: 24px; margin: 18px 0 8px; }",
                "h2 { font-size: 18px; margin: 22px 0 8px; border-bottom: 1px solid var(--rule); padding-bottom: 3px; }",
                "h3 { font-size: 16px; margin: 14px 0 4px; }",
                "dl.case { display: grid; grid-template-columns: repeat(2, minmax(0, 1fr)); gap: 4px 18px; margin: 0; }",
                "dl.case div { display: flex; gap: 8px; }",
                "dt { color: var(--muted); min-width: 8.5em; }",
                "dd { margin: 0; word-break: break-word; }",
                ".finding { margin: 10px 0 18px; padding: 8px 14px 4px; border-left: 6px solid #7a8591; background: var(--tint); }",
                ".finding.status-identified { border-color: #1f6f50; }",
                ".finding.status-inconclusive { border-color: #b07a12; }",
                ".plain { font-size: 16px; font-weight: bold; margin: 6px 0; }",
                ".how, .detail { color: var(--muted); margin: 4px 0; }",
                "figure { margin: 10px 0 12px; }",
                "figure img { display: block; max-width: 100%; height: auto; border: 1px solid var(--rule); background: #fff; }",
                "figcaption { color: var(--muted); font-size: 12px; margin-top: 3px; }",
                "table { border-collapse: collapse; width: 100%; font-size: 13px; }",
                "th, td { padding: 4px 6px; border-bottom: 1px solid var(--rule); text-align: left; vertical-align: top; }",
                "td.hash { font-family: \"DejaVu Sans Mono\", \"Liberation Mono\", monospace; font-size: 10px; word-break: break-all; }",
                ".safety { margin: 18px 0 0; padding: 10px 16px; border: 1px solid #c9a23f; background: #fffaf0; }",
                ".safety h2 { margin: 0 0 4px; border: none; font-size: 15px; }",
                ".safety p { margin: 0; }",
                "footer { margin-top: 24px; color: var(--muted); font-size: 12px; border-top: 1px solid var(--rule); padding-top: 6px; }",
                "@page { size: " + size + "; margin: 16mm 15mm 18mm; }",
                "@media print {",
                "  body { font-size: 10pt; }",
                "  main { max-width: none; padding: 0; }",
                "  h1 { font-size: 16pt; }",
                "  figure, tr, .safety, dl.case, .plain { break-inside: avoid; }",
                "  h2, h3 { break-after: avoid; }",
                "  figure img { max-height: 105mm; width: auto; max-width: 100%; }",
                "  .finding, .safety { -webkit-print-color-adjust: exact; print-color-adjust: exact; }",
                "}",
                "");
    }
}
