package org.risetrace.report;

import org.jfree.chart.renderer.PaintScale;

import java.awt.Color;
import java.awt.Paint;
import java.io.Serializable;

/** A JFreeChart paint scale over one of our {@link ColourMaps}, optionally reversed (low values light). */
final class ColourScale implements PaintScale, Serializable {
    private static final long serialVersionUID = 1L;
    private final ColourMaps map;
    private final double lower, upper;
    private final boolean reversed;

    ColourScale(ColourMaps map, double lower, double upper, boolean reversed) {
        if (!(upper > lower)) upper = lower + 1e-6;
        this.map = map;
        this.lower = lower;
        this.upper = upper;
        this.reversed = reversed;
    }

    @Override public double getLowerBound() { return lower; }

    @Override public double getUpperBound() { return upper; }

    @Override
    public Paint getPaint(double value) {
        if (Double.isNaN(value)) return new Color(0xd8d8d8);
        double t = (value - lower) / (upper - lower);
        return map.colour(reversed ? 1 - t : t);
    }
}
