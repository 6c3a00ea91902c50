package org.risetrace.report;

import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.risetrace.analysis.Analysis;
import org.risetrace.analysis.AnalysisResult;
import org.risetrace.analysis.FrameRecord;
import org.risetrace.analysis.PartResult;
import org.risetrace.analysis.VerdictStatus;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

/** analysis.json against the schema list of the analysis issue (item 7) and RFC 8259 (JSON has no NaN). */
class AnalysisJsonTest {
    private static final ObjectMapper READER = new ObjectMapper()
            .enable(DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES);

    private static void assertFields(JsonNode node, String where, String... names) {
        for (String n : names) assertTrue(node.has(n), where + " lacks " + n + ": " + node);
    }

    @Test
    void documentCarriesEverySchemaField(@TempDir Path dir) throws Exception {
        Analysis a = DemoAnalysis.build();
        Path file = dir.resolve("analysis.json");
        AnalysisJson.write(a.result(), file);
        JsonNode root = READER.readTree(Files.readString(file));
        assertFields(root, "document", "schema", "tool", "version", "created_utc", "series", "board", "profile",
                "parameters", "injection", "verdict", "parts", "hotspots", "frames");
        assertEquals(AnalysisResult.SCHEMA, root.get("schema").asText());
        assertFields(root.get("verdict"), "verdict", "status", "ref", "rate_k_per_s", "runner_up_ref",
                "separation_sigma", "reason");
        assertEquals("identified", root.get("verdict").get("status").asText());
        assertEquals(DemoAnalysis.build().result().parts().size(), root.get("parts").size());
        for (JsonNode p : root.get("parts"))
            assertFields(p, "part", "ref", "rank", "rate_k_per_s", "rate_se", "rise_k", "onset_s", "tau_s", "dt_inf_k");
        for (JsonNode h : root.get("hotspots")) assertFields(h, "hotspot", "x_mm", "y_mm", "rise_k", "ref");
        assertEquals(DemoAnalysis.FRAMES, root.get("frames").size());
        for (JsonNode f : root.get("frames")) {
            assertFields(f, "frame", "file", "t_s", "sha256", "registration");
            assertFields(f.get("registration"), "registration", "status", "rms_px", "board_corners_px");
            // SHA-256 is 256 bits: 64 hex digits (FIPS 180-4)
            assertTrue(f.get("sha256").asText().matches("[0-9a-f]{64}"));
        }
        assertEquals("VCORE", root.get("injection").get("from_rail").asText());
    }

    @Test
    void eachFittedPartCarriesItsModelWithErrorsAndTheSelection() throws Exception {
        JsonNode root = READER.readTree(AnalysisJson.toJson(DemoAnalysis.build().result()));
        JsonNode q3 = root.get("parts").get(0);
        JsonNode fit = q3.get("fit");
        assertEquals(List.of("model", "t0_s", "terms", "dt_inf_k", "dt_inf_se", "rms_k", "n", "f_statistic",
                "p_value", "selection"), names(fit));
        // the demo fault has a die and a board term (DemoAnalysis): two constants, fast first
        assertEquals("double", fit.get("model").asText());
        assertEquals(2, fit.get("terms").size());
        for (JsonNode term : fit.get("terms")) {
            assertEquals(List.of("dt_k", "dt_se", "tau_s", "tau_se"), names(term));
            assertTrue(term.get("tau_se").asDouble() > 0 && term.get("dt_se").asDouble() > 0);
        }
        assertTrue(fit.get("terms").get(0).get("tau_s").asDouble() < fit.get("terms").get(1).get("tau_s").asDouble());
        // the flat fields stay meaningful: tau_s the slow constant, dt_inf_k the sum, fit_rms_k the model's RMS
        assertEquals(fit.get("terms").get(1).get("tau_s").asDouble(), q3.get("tau_s").asDouble(), 0.0);
        assertEquals(fit.get("terms").get(0).get("dt_k").asDouble() + fit.get("terms").get(1).get("dt_k").asDouble(),
                q3.get("dt_inf_k").asDouble(), 1e-12);
        assertEquals(fit.get("rms_k").asDouble(), q3.get("fit_rms_k").asDouble(), 0.0);
        assertTrue(fit.get("p_value").asDouble() < 0.01);
        // a one-constant part: one term, and the test that kept it
        JsonNode single = null;
        for (JsonNode p : root.get("parts")) if (p.get("fit").path("model").asText().equals("single")) single = p;
        org.junit.jupiter.api.Assertions.assertNotNull(single, "the demo has a part fitted with one time constant");
        assertEquals(1, single.get("fit").get("terms").size());
        assertTrue(single.get("fit").get("selection").asText().startsWith("one time constant"));
    }

    @Test
    void fieldsKeepTheRecordOrder() throws Exception {
        JsonNode root = READER.readTree(AnalysisJson.toJson(DemoAnalysis.build().result()));
        assertEquals(List.of("schema", "tool", "version", "created_utc", "series", "board", "profile", "parameters",
                "injection", "verdict", "parts", "hotspots", "frames"), names(root));
        assertEquals(List.of("status", "ref", "rate_k_per_s", "runner_up_ref", "separation_sigma", "reason"),
                names(root.get("verdict")));
        assertEquals(List.of("ref", "rank", "rate_k_per_s", "rate_se", "rise_k", "onset_s", "tau_s", "tau_se",
                "dt_inf_k", "dt_inf_se", "fit_rms_k", "noise_k", "valid_fraction", "emissivity", "warnings", "fit"),
                names(root.get("parts").get(0)));
        // map entries sorted by key, so equal inputs give equal bytes
        List<String> params = names(root.get("parameters"));
        List<String> sorted = new ArrayList<>(params);
        sorted.sort(null);
        assertEquals(sorted, params);
        assertEquals(AnalysisJson.toJson(DemoAnalysis.build().result()), AnalysisJson.toJson(DemoAnalysis.build().result()));
    }

    @Test
    void nonFiniteNumbersBecomeNull() throws Exception {
        AnalysisResult r = DemoAnalysis.build().result();
        List<PartResult> parts = new ArrayList<>(r.parts());
        PartResult p = parts.get(0);
        parts.set(0, new PartResult(p.ref(), p.rank(), Double.NaN, Double.POSITIVE_INFINITY, p.riseK(), null,
                p.tauS(), p.tauSe(), p.dtInfK(), p.dtInfSe(), p.fitRmsK(), p.noiseK(), p.validFraction(),
                p.emissivity(), p.warnings()));
        List<FrameRecord> frames = new ArrayList<>(r.frames());
        FrameRecord f = frames.get(1);
        frames.set(1, new FrameRecord(f.file(), Double.NaN, f.sha256(), f.used(), new FrameRecord.Registration(
                "ok", Double.NaN, null, new double[][]{{1, Double.NaN}, {2, 3}, {4, 5}, {6, 7}})));
        AnalysisResult bad = new AnalysisResult(r.schema(), r.tool(), r.version(), r.createdUtc(), r.series(),
                r.board(), r.profile(), r.parameters(), r.injection(), r.verdict(), parts, r.hotspots(), frames);
        String json = AnalysisJson.toJson(bad);
        // RFC 8259 section 6: "Numeric values that cannot be represented ... (such as Infinity and NaN) are not
        // permitted"
        assertFalse(json.contains("NaN"), "NaN in the document");
        assertFalse(json.contains("Infinity"), "Infinity in the document");
        JsonNode root = READER.readTree(json);  // a strict parser accepts it
        assertTrue(root.get("parts").get(0).get("rate_k_per_s").isNull());
        assertTrue(root.get("parts").get(0).get("rate_se").isNull());
        assertTrue(root.get("frames").get(1).get("t_s").isNull());
        assertTrue(root.get("frames").get(1).get("registration").get("rms_px").isNull());
        assertTrue(root.get("frames").get(1).get("registration").get("board_corners_px").get(0).get(1).isNull());
        assertEquals(2.0, root.get("frames").get(1).get("registration").get("board_corners_px").get(1).get(0).asDouble());
        // the demo's parameters carry a NaN on purpose
        assertTrue(root.get("parameters").get("nan_example").isNull());
    }

    @Test
    void documentReadsBackIntoTheRecord() throws Exception {
        AnalysisResult r = DemoAnalysis.build().result();
        AnalysisResult back = READER.readValue(AnalysisJson.toJson(r), AnalysisResult.class);
        assertEquals(VerdictStatus.IDENTIFIED, back.verdict().status());
        assertEquals(r.verdict(), back.verdict());
        assertEquals(r.parts(), back.parts());
        assertEquals(r.hotspots(), back.hotspots());
        assertEquals(r.injection(), back.injection());
        assertEquals(r.frames().get(5).sha256(), back.frames().get(5).sha256());
        assertEquals(r.frames().get(5).registration().boardCornersPx()[2][1],
                back.frames().get(5).registration().boardCornersPx()[2][1]);
    }

    @Test
    void outputIsPrettyPrinted() {
        String json = AnalysisJson.toJson(DemoAnalysis.build().result());
        assertTrue(json.startsWith("{\n  \"schema\""), json.substring(0, 40));
        assertTrue(json.endsWith("}\n"));
    }

    private static List<String> names(JsonNode node) {
        List<String> out = new ArrayList<>();
        for (Iterator<String> it = node.fieldNames(); it.hasNext(); ) out.add(it.next());
        return out;
    }
}
