package org.risetrace.frame;

import com.fasterxml.jackson.core.JsonLocation;
import com.fasterxml.jackson.core.JsonParseException;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.StreamReadFeature;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.MapperFeature;
import com.fasterxml.jackson.databind.cfg.CoercionAction;
import com.fasterxml.jackson.databind.cfg.CoercionInputShape;
import com.fasterxml.jackson.databind.json.JsonMapper;
import com.fasterxml.jackson.databind.type.LogicalType;

import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * The one JSON reading configuration for every file a user hands the tool (board file, series.json, profiles,
 * scenarios): a key given twice is an error (Jackson resolves it silently, last one wins, and in a board file that
 * flipped a verdict), a string is never taken for a number ({@code "x_mm": "20"}), a number never for a string or
 * a flag, a fraction never for a whole number, and nothing may follow the document.
 */
public final class StrictJson {
    private static final Pattern DUPLICATE = Pattern.compile("Duplicate field '([^']*)'");

    private StrictJson() { }

    /** A mapper builder with the strict reading rules; callers add their own features (unknown fields etc.). */
    public static JsonMapper.Builder builder() {
        JsonMapper.Builder b = JsonMapper.builder()
                .enable(StreamReadFeature.STRICT_DUPLICATE_DETECTION)
                .disable(MapperFeature.ALLOW_COERCION_OF_SCALARS)
                .disable(DeserializationFeature.ACCEPT_FLOAT_AS_INT)
                .enable(DeserializationFeature.FAIL_ON_TRAILING_TOKENS)
                .enable(DeserializationFeature.FAIL_ON_NULL_FOR_PRIMITIVES);
        b.withCoercionConfig(LogicalType.Integer, c -> c.setCoercion(CoercionInputShape.String, CoercionAction.Fail)
                .setCoercion(CoercionInputShape.Boolean, CoercionAction.Fail));
        b.withCoercionConfig(LogicalType.Float, c -> c.setCoercion(CoercionInputShape.String, CoercionAction.Fail)
                .setCoercion(CoercionInputShape.Boolean, CoercionAction.Fail));
        b.withCoercionConfig(LogicalType.Boolean, c -> c.setCoercion(CoercionInputShape.String, CoercionAction.Fail)
                .setCoercion(CoercionInputShape.Integer, CoercionAction.Fail));
        b.withCoercionConfig(LogicalType.Textual, c -> c.setCoercion(CoercionInputShape.Integer, CoercionAction.Fail)
                .setCoercion(CoercionInputShape.Float, CoercionAction.Fail)
                .setCoercion(CoercionInputShape.Boolean, CoercionAction.Fail));
        return b;
    }

    private static final Pattern FOUND = Pattern.compile("(?:from|coerce) (String|Integer|Floating-point|Boolean|Array|"
            + "Object|Null|null)\\b", Pattern.CASE_INSENSITIVE);

    /**
     * A JSON reading error in plain words, without the library's wording (class names, coercion settings, source
     * redaction notes): "expected a number, found text", "the file ends before the JSON document does". Line and
     * column are the caller's to add.
     */
    public static String plainProblem(JsonProcessingException e) {
        if (e instanceof com.fasterxml.jackson.core.io.JsonEOFException)
            return "the file ends before the JSON document does (cut short?)";
        if (e instanceof com.fasterxml.jackson.databind.exc.MismatchedInputException m && m.getTargetType() != null) {
            String expected = expected(m.getTargetType());
            Matcher f = FOUND.matcher(String.valueOf(m.getOriginalMessage()));
            String found = f.find() ? found(f.group(1)) : null;
            return "expected " + expected + (found == null ? "" : ", found " + found);
        }
        String msg = String.valueOf(e.getOriginalMessage()).split("\n")[0];
        int redacted = msg.indexOf(" (start marker at");
        if (redacted >= 0) msg = msg.substring(0, redacted);
        return msg.replace("REDACTED (`StreamReadFeature.INCLUDE_SOURCE_IN_LOCATION` disabled)", "the file");
    }

    private static String expected(Class<?> t) {
        if (t == double.class || t == Double.class || t == float.class || t == Float.class) return "a number";
        if (t == int.class || t == Integer.class || t == long.class || t == Long.class) return "a whole number";
        if (t == boolean.class || t == Boolean.class) return "true or false";
        if (CharSequence.class.isAssignableFrom(t)) return "text in quotes";
        if (t.isArray() || java.util.Collection.class.isAssignableFrom(t)) return "a list [ ... ]";
        return "an object { ... }";
    }

    private static String found(String shape) {
        return switch (shape.toLowerCase(java.util.Locale.ROOT)) {
            case "string" -> "text";
            case "integer", "floating-point" -> "a number";
            case "boolean" -> "true or false";
            case "array" -> "a list";
            case "object" -> "an object";
            default -> "null";
        };
    }

    /** "duplicate key 'x_mm' at line L, column C" for a duplicate-key error, else null. */
    public static String duplicateKey(JsonProcessingException e) {
        if (!(e instanceof JsonParseException)) return null;
        Matcher m = DUPLICATE.matcher(String.valueOf(e.getOriginalMessage()));
        if (!m.find()) return null;
        JsonLocation loc = e.getLocation();
        return "duplicate key '" + m.group(1) + "'"
                + (loc == null || loc.getLineNr() < 0 ? "" : " at line " + loc.getLineNr() + ", column " + loc.getColumnNr());
    }
}
