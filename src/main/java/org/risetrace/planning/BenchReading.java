package org.risetrace.planning;

/**
 * One meter reading as the technician wrote it down.
 *
 * @param line         line in the readings file (1 = the header)
 * @param what         what was measured, e.g. "phase inductor" or "rail to ground"
 * @param where        where: a designator or rail name
 * @param valueText    the value as written (its last digit is the meter's resolution)
 * @param value        the value
 * @param unit         the unit as written, e.g. "ohm", "mohm", "V", "uH"
 * @param instrument   the meter, free text (may be null)
 * @param frequencyHz  the test frequency of an AC meter (may be null)
 * @param inductanceUh the part's rated inductance, for the ideal-reactance comparison (may be null)
 * @param notes        free text (may be null)
 */
public record BenchReading(int line, String what, String where, String valueText, double value, String unit,
                           String instrument, Double frequencyHz, Double inductanceUh, String notes) {
}
