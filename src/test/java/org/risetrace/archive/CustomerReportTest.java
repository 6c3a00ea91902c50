package org.risetrace.archive;

import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.analysis.AnalysisOptions;
import org.risetrace.analysis.Analyzer;
import org.risetrace.report.ReportHtml;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** The customer report: header, plain-words findings, the archived maps, cautions; stored and logged; prints. */
class CustomerReportTest {
    @TempDir
    static Path shared;
    @TempDir
    Path tmp;
    static Path archive;
    static Archive.AnalysisRecord analysis;

    @BeforeAll
    static void makeCase() {
        archive = shared.resolve("archive");
        try (Archive a = Archive.open(ArchiveSettings.sqlite(archive), "tess")) {
            a.createCase(new Archive.NewCase("C-5", "ticket <5> & co", "charger DB-5 <script>alert(1)</script>", "SN5",
                    "trips the supply", "tess"));
            a.addSeries("C-5", Fixtures.series(shared.resolve("bench-1"), 11), null, null);
            analysis = CaseAnalysis.analyse(a, "C-5", "bench-1", AnalysisOptions.defaults(), CaseAnalysis.Mode.AUTO, 2,
                    Analyzer.Progress.NONE);
        }
    }

    private static final Shop SHOP = new Shop("Bench Nine Repairs", List.of("12 Mill Lane", "+00 555 0100"));

    @Test
    void theReportCarriesTheCaseTheFindingsTheMapsAndTheCautionsAndIsStoredAndLogged() throws Exception {
        try (Archive a = Archive.open(ArchiveSettings.sqlite(archive), "tess")) {
            CustomerReport.Made m = CustomerReport.make(a, "C-5", SHOP, CustomerReport.Paper.A4);
            String h = m.html();
            for (String s : List.of("Bench Nine Repairs", "12 Mill Lane", "C-5", "SN5", "trips the supply", "tess",
                    "ticket &lt;5&gt; &amp; co", org.risetrace.report.Html.esc(ReportHtml.SAFETY_TEXT), "size: A4"))
                assertTrue(h.contains(s), s);
            assertFalse(h.contains("<script>"), "the shop's text is escaped");
            assertFalse(h.contains("<script"), "no script at all");
            if (analysis.verdictRef() != null && analysis.verdictStatus().startsWith("identified"))
                assertTrue(h.contains("The part marked " + analysis.verdictRef() + " warmed up faster"), "plain words");
            assertTrue(h.contains("data:image/png;base64,"), "the archived maps are embedded");
            String analysisJson = analysis.outputs().stream().filter(o -> o.name().equals("analysis.json")).findFirst()
                    .orElseThrow().sha256();
            assertTrue(h.contains(analysisJson), "the evidence's checksum");
            // stored byte for byte and logged
            assertEquals(h, Files.readString(a.store().path(m.record().sha256()), StandardCharsets.UTF_8));
            assertTrue(a.show("C-5").custody().stream().anyMatch(e -> e.action().equals("customer-report")
                    && m.record().sha256().equals(e.sha256())));
            assertTrue(Verifier.verify(a, "C-5").clean());
            assertTrue(CustomerReport.make(a, "C-5", SHOP, CustomerReport.Paper.LETTER).html().contains("size: letter"));
        }
    }

    @Test
    void theFindingIsWordedForHowItWasMeasured() {
        // a lock-in finding is a part that followed the switched current, not one that warmed fastest; a comparison
        // has two images, not a rate (the customer reads what was measured, common practice for an inspection report)
        java.util.function.Function<String, Archive.AnalysisRecord> record = mode -> new Archive.AnalysisRecord(1,
                "C-5", "s", "2026-12-04T00:00:00Z", "tess", "0.1.0", mode, "{}", "identified", "C9", "h", "r", List.of());
        assertTrue(CustomerReport.plainWords(record.apply("lock-in")).startsWith(
                "The part marked C9 warmed and cooled in step with the test current"));
        assertTrue(CustomerReport.plainWords(record.apply("compare")).startsWith(
                "The part marked C9 warmed more than every other part between an image taken before"));
        assertTrue(CustomerReport.plainWords(record.apply("steady")).startsWith(
                "The part marked C9 warmed up faster than every other part"));
    }

    @Test
    void theShopComesFromAConfigFileAndAMissingOneIsNamed() throws Exception {
        Path cfg = tmp.resolve("config");
        Map<String, String> env = Map.of("XDG_CONFIG_HOME", cfg.toString());
        ArchiveException e = assertThrows(ArchiveException.class, () -> Shop.load(null, tmp, env));
        assertTrue(e.getMessage().contains("shop.json"), e.getMessage());
        Files.createDirectories(cfg.resolve("risetrace"));
        Files.writeString(cfg.resolve("risetrace/shop.json"), "{\"name\": \"Bench Nine\", \"contact\": [\"a\", \"b\"]}");
        assertEquals(new Shop("Bench Nine", List.of("a", "b")), Shop.load(null, tmp, env));
        Files.writeString(tmp.resolve("shop.json"), "{\"name\": \"In the archive\"}");
        assertEquals("In the archive", Shop.load(null, tmp, env).name(), "the archive's shop.json first");
        Files.writeString(tmp.resolve("bad.json"), "{\"name\": \"x\", \"colour\": 1}");
        assertThrows(ArchiveException.class, () -> Shop.load(tmp.resolve("bad.json"), tmp, env), "unknown field");
    }

    /**
     * Printed as a user would, with headless Chromium's --print-to-pdf: the page size is the chosen paper, A4
     * 210 x 297 mm = 595.3 x 841.9 pt (ISO 216) or US Letter 8.5 x 11 in = 612 x 792 pt (ANSI/ASME Y14.1), and the
     * report spans at most three pages.
     */
    @Test
    void theReportPrintsOnA4AndLetter() throws Exception {
        Path chromium = Path.of("/usr/bin/chromium");
        Assumptions.assumeTrue(Files.isExecutable(chromium), "headless Chromium is not installed");
        try (Archive a = Archive.open(ArchiveSettings.sqlite(archive), "tess")) {
            for (CustomerReport.Paper paper : CustomerReport.Paper.values()) {
                Path html = tmp.resolve(paper + ".html"), pdf = tmp.resolve(paper + ".pdf");
                Files.writeString(html, CustomerReport.make(a, "C-5", SHOP, paper).html());
                Process p = new ProcessBuilder(chromium.toString(), "--headless", "--no-sandbox", "--disable-gpu",
                        "--no-pdf-header-footer", "--user-data-dir=" + tmp.resolve("profile-" + paper),
                        "--print-to-pdf=" + pdf, html.toUri().toString()).redirectErrorStream(true)
                        .redirectOutput(tmp.resolve("chromium.log").toFile()).start();
                assertTrue(p.waitFor(120, TimeUnit.SECONDS), "chromium finished");
                String text = new String(Files.readAllBytes(pdf), StandardCharsets.ISO_8859_1);
                Matcher m = Pattern.compile("/MediaBox\\s*\\[\\s*0 0 ([0-9.]+) ([0-9.]+)\\s*\\]").matcher(text);
                int pages = 0;
                while (m.find()) {
                    pages++;
                    double w = Double.parseDouble(m.group(1)), hgt = Double.parseDouble(m.group(2));
                    double[] want = paper == CustomerReport.Paper.A4 ? new double[]{595.28, 841.89} : new double[]{612, 792};
                    assertEquals(want[0], w, 1.0, paper + " width in points");
                    assertEquals(want[1], hgt, 1.0, paper + " height in points");
                }
                assertTrue(pages >= 1 && pages <= 3, paper + ": " + pages + " pages");
            }
        }
    }
}
