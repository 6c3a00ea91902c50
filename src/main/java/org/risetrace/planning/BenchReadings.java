package org.risetrace.planning;

import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.annotation.JsonPropertyOrder;

import java.math.BigDecimal;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

import static org.risetrace.planning.Numbers.sig;

/**
 * Bench meter readings, assessed: like readings (same {@code what}, same base unit) are compared with the
 * modified z-score of Iglewicz and Hoaglin ({@link RobustStats}); an impedance reading of an inductor with its
 * rated inductance and the meter's frequency is compared with the ideal reactance |Z| = 2 pi f L.
 *
 * @param file     the readings file as given
 * @param rows     every reading, in file order
 * @param findings the outliers and the inductor comparisons in plain sentences
 */
@JsonPropertyOrder({"file", "rows", "findings"})
public record BenchReadings(@JsonProperty("file") String file, @JsonProperty("rows") List<Row> rows,
                            @JsonProperty("findings") List<String> findings) {

    /** Groups need this many readings before one of them can stand out. */
    public static final int MIN_GROUP = 3;
    /** Power inductors are commonly rated at +/-20 % (common practice). */
    public static final double INDUCTOR_TOLERANCE = 0.20;

    public BenchReadings {
        rows = List.copyOf(rows);
        findings = List.copyOf(findings);
    }

    /** The rows flagged as outliers. */
    public List<Row> outliers() {
        return rows.stream().filter(Row::outlier).toList();
    }

    /**
     * One reading with its assessment. Values are in the reading's own unit.
     *
     * @param groupSize        like readings, this one included
     * @param groupMedian      their median (null: group too small)
     * @param modifiedZ        0.6745 (x - median) / MAD (null: group too small)
     * @param outlier          |modified z| above 3.5
     * @param ratioToMedian    x / median (null: group too small or median 0)
     * @param expected         the ideal value: |Z| = 2 pi f L for an impedance, L for an inductance (null: none)
     * @param ratioToExpected  x / expected
     * @param withinTolerance  within +/-20 % of the expected value
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    @JsonPropertyOrder({"line", "what", "where", "value", "unit", "instrument", "frequency_hz", "inductance_uh",
            "notes", "group_size", "group_median", "modified_z", "outlier", "ratio_to_median", "expected",
            "ratio_to_expected", "within_tolerance"})
    public record Row(@JsonProperty("line") int line, @JsonProperty("what") String what,
                      @JsonProperty("where") String where, @JsonProperty("value") double value,
                      @JsonProperty("unit") String unit, @JsonProperty("instrument") String instrument,
                      @JsonProperty("frequency_hz") Double frequencyHz,
                      @JsonProperty("inductance_uh") Double inductanceUh, @JsonProperty("notes") String notes,
                      @JsonProperty("group_size") int groupSize, @JsonProperty("group_median") Double groupMedian,
                      @JsonProperty("modified_z") Double modifiedZ, @JsonProperty("outlier") boolean outlier,
                      @JsonProperty("ratio_to_median") Double ratioToMedian,
                      @JsonProperty("expected") Double expected,
                      @JsonProperty("ratio_to_expected") Double ratioToExpected,
                      @JsonProperty("within_tolerance") Boolean withinTolerance) {
    }

    /** The ideal inductor's reactance |Z| = 2 pi f L in ohms (f in hertz, L in microhenries). */
    public static double reactanceOhms(double frequencyHz, double inductanceUh) {
        return 2 * Math.PI * frequencyHz * inductanceUh * 1e-6;
    }

    /**
     * Assesses readings. Within a group the MAD is floored at a quarter of the typical (median) resolution the
     * readings were written with (the MAD of a uniform rounding error of one step is a quarter step): three
     * identical readings otherwise give MAD 0 and make any other value infinitely far out. The median, not the
     * coarsest: an outlier written with a coarse prefix ("1 kohm" among "1 ohm") set the floor itself and hid.
     */
    public static BenchReadings assess(String file, List<BenchReading> readings) {
        Map<String, List<Integer>> groups = new LinkedHashMap<>();
        for (int i = 0; i < readings.size(); i++) groups.computeIfAbsent(groupKey(readings.get(i)), k -> new ArrayList<>()).add(i);
        Row[] rows = new Row[readings.size()];
        List<String> findings = new ArrayList<>();
        for (List<Integer> members : groups.values()) {
            int n = members.size();
            double[] base = new double[n], steps = new double[n];
            for (int k = 0; k < n; k++) {
                BenchReading r = readings.get(members.get(k));
                double factor = Units.of(r.unit()).factor();
                base[k] = r.value() * factor;
                steps[k] = resolution(r.valueText()) * factor;
            }
            double step = n == 0 ? 0 : RobustStats.median(steps);
            double median = n >= MIN_GROUP ? RobustStats.median(base) : Double.NaN;
            double mad = n >= MIN_GROUP ? Math.max(RobustStats.mad(base), step / 4) : Double.NaN;
            for (int k = 0; k < n; k++) {
                BenchReading r = readings.get(members.get(k));
                double factor = Units.of(r.unit()).factor();
                Double z = null, med = null, ratio = null;
                boolean out = false;
                if (n >= MIN_GROUP) {
                    z = RobustStats.modifiedZ(base[k], median, mad);
                    med = median / factor;
                    ratio = median != 0 ? base[k] / median : null;
                    out = Math.abs(z) > RobustStats.OUTLIER_LIMIT;
                }
                Double expected = expectedValue(r);
                Double toExpected = expected == null ? null : r.value() / expected;
                Boolean within = toExpected == null ? null : Math.abs(toExpected - 1) <= INDUCTOR_TOLERANCE;
                rows[members.get(k)] = new Row(r.line(), r.what(), r.where(), r.value(), r.unit(), r.instrument(),
                        r.frequencyHz(), r.inductanceUh(), r.notes(), n, med, z, out, ratio, expected, toExpected, within);
            }
        }
        for (Row r : rows) {
            if (r.outlier())
                findings.add(r.where() + " (" + r.what() + ") reads " + sig(r.value()) + " " + r.unit() + ": "
                        + (r.ratioToMedian() == null ? "" : sig(r.ratioToMedian(), 2) + " x ")
                        + "the median " + sig(r.groupMedian()) + " " + r.unit() + " of " + r.groupSize()
                        + " like readings, modified z " + String.format(Locale.ROOT, "%.1f", r.modifiedZ())
                        + " (outlier beyond " + RobustStats.OUTLIER_LIMIT + ")");
        }
        for (Row r : rows) {
            if (r.expected() == null) continue;
            boolean impedance = Units.of(r.unit()).base().equals("ohm");
            findings.add(r.where() + " (" + r.what() + ") reads " + sig(r.value()) + " " + r.unit()
                    + (impedance ? " at " + sig(r.frequencyHz() / 1000) + " kHz against " + sig(r.expected())
                    + " " + r.unit() + " for an ideal " + sig(r.inductanceUh()) + " uH"
                    : " against its rated " + sig(r.expected()) + " " + r.unit())
                    + ": " + sig(r.ratioToExpected(), 3) + " x, "
                    + (r.withinTolerance() ? "within" : "outside") + " the +/-" + (int) (INDUCTOR_TOLERANCE * 100)
                    + " % of a power inductor's rating");
        }
        return new BenchReadings(file, List.of(rows), findings);
    }

    /** Like readings share what was measured (case and spacing aside) and the base unit. */
    static String groupKey(BenchReading r) {
        return r.what().strip().replaceAll("\\s+", " ").toLowerCase(Locale.ROOT) + "|" + Units.of(r.unit()).base();
    }

    /** The step of the last digit written: 0.01 for "0.15", 1 for "150", 10 for "1.5e2". */
    static double resolution(String valueText) {
        return new BigDecimal(valueText.strip()).ulp().doubleValue();
    }

    /** The ideal reading in the reading's own unit, or null when the file gives nothing to compare with. */
    static Double expectedValue(BenchReading r) {
        if (r.inductanceUh() == null) return null;
        Units.Unit u = Units.of(r.unit());
        if (u.base().equals("ohm") && r.frequencyHz() != null)
            return reactanceOhms(r.frequencyHz(), r.inductanceUh()) / u.factor();
        if (u.base().equals("H")) return r.inductanceUh() * 1e-6 / u.factor();
        return null;
    }
}
