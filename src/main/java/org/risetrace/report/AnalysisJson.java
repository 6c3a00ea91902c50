package org.risetrace.report;

import com.fasterxml.jackson.core.JsonGenerator;
import com.fasterxml.jackson.databind.JsonSerializer;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.ObjectWriter;
import com.fasterxml.jackson.databind.SerializationFeature;
import com.fasterxml.jackson.databind.SerializerProvider;
import com.fasterxml.jackson.databind.module.SimpleModule;
import org.risetrace.analysis.AnalysisResult;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;

/**
 * Writes the analysis.json document: the {@link AnalysisResult} record with its snake_case names, fields in record
 * order, map entries sorted by key (so two runs with the same inputs give the same bytes apart from the time), pretty
 * printed. JSON has no NaN or infinity (RFC 8259, section 6): a non-finite double is written as null.
 */
public final class AnalysisJson {
    private static final ObjectWriter WRITER = mapper().writerWithDefaultPrettyPrinter();

    private AnalysisJson() { }

    /** The mapper the report uses for JSON: non-finite doubles become null, map entries sorted by key. */
    static ObjectMapper mapper() {
        SimpleModule finite = new SimpleModule("risetrace-finite-doubles");
        finite.addSerializer(Double.class, new FiniteDouble());
        finite.addSerializer(Double.TYPE, new FiniteDouble());
        finite.addSerializer(Float.class, new FiniteFloat());
        finite.addSerializer(Float.TYPE, new FiniteFloat());
        finite.addSerializer(double[].class, new FiniteDoubleArray());
        finite.addSerializer(float[].class, new FiniteFloatArray());
        return new ObjectMapper()
                .registerModule(finite)
                .enable(SerializationFeature.ORDER_MAP_ENTRIES_BY_KEYS)
                .disable(SerializationFeature.FAIL_ON_EMPTY_BEANS);
    }

    public static String toJson(AnalysisResult result) {
        try {
            return WRITER.writeValueAsString(result) + "\n";
        } catch (IOException e) {
            throw new UncheckedIOException("analysis.json could not be serialised", e);
        }
    }

    public static void write(AnalysisResult result, Path file) {
        try {
            Files.writeString(file, toJson(result), StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write " + file, e);
        }
    }

    private static void writeFinite(double v, JsonGenerator gen) throws IOException {
        if (Double.isFinite(v)) gen.writeNumber(v); else gen.writeNull();
    }

    private static final class FiniteDouble extends JsonSerializer<Double> {
        @Override
        public void serialize(Double v, JsonGenerator gen, SerializerProvider p) throws IOException {
            writeFinite(v, gen);
        }
    }

    private static final class FiniteFloat extends JsonSerializer<Float> {
        @Override
        public void serialize(Float v, JsonGenerator gen, SerializerProvider p) throws IOException {
            if (Float.isFinite(v)) gen.writeNumber(v); else gen.writeNull();
        }
    }

    private static final class FiniteDoubleArray extends JsonSerializer<double[]> {
        @Override
        public void serialize(double[] v, JsonGenerator gen, SerializerProvider p) throws IOException {
            gen.writeStartArray();
            for (double d : v) writeFinite(d, gen);
            gen.writeEndArray();
        }
    }

    private static final class FiniteFloatArray extends JsonSerializer<float[]> {
        @Override
        public void serialize(float[] v, JsonGenerator gen, SerializerProvider p) throws IOException {
            gen.writeStartArray();
            for (float d : v) {
                if (Float.isFinite(d)) gen.writeNumber(d); else gen.writeNull();
            }
            gen.writeEndArray();
        }
    }
}
