package org.risetrace.synth;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;

/**
 * The board drawn once as a picture in board space: an emissivity per texel and what each texel belongs to (the
 * bench mat, the bare board, or a marked part's body). Texel (u, v) has its centre at board millimetres
 * ((u + 0.5) / pxPerMm - marginMm, (v + 0.5) / pxPerMm - marginMm); the picture reaches {@code marginMm} beyond
 * every board edge, enough for the anti-alias blur, and the mat beyond it is uniform.
 *
 * <p>Emissivities: solder mask 0.86-0.92, copper under mask a few hundredths lower, exposed and tinned copper (pads,
 * some traces, an edge rail, mounting rings, fiducials) 0.1-0.3, silkscreen 0.94, part bodies from the bundled
 * materials table (epoxy 0.92, ceramic 0.90, nickel lid 0.10; resistors 0.94 with no material named), chip end caps
 * and gull-wing leads 0.08-0.2, the mat 0.95 (common practice ranges, values "from memory").
 */
final class SpotBoard {
    /** Owner codes besides part indices. */
    static final short MAT = -2, BOARD = -1;
    static final float MAT_EMISSIVITY = 0.95f;

    /** One marked part and its true surface. */
    record PartLayout(String ref, String kind, String material, double xMm, double yMm, double wMm, double hMm,
                      double emissivity) {
    }

    final double widthMm, heightMm, marginMm, pxPerMm;
    final int texW, texH;
    final float[] emissivity;
    final short[] owner;
    final List<PartLayout> parts = new ArrayList<>();
    final double maskEmissivity;

    private SpotBoard(double widthMm, double heightMm, double marginMm, double pxPerMm, double maskEmissivity) {
        this.widthMm = widthMm;
        this.heightMm = heightMm;
        this.marginMm = marginMm;
        this.pxPerMm = pxPerMm;
        this.maskEmissivity = maskEmissivity;
        texW = (int) Math.ceil((widthMm + 2 * marginMm) * pxPerMm);
        texH = (int) Math.ceil((heightMm + 2 * marginMm) * pxPerMm);
        emissivity = new float[texW * texH];
        owner = new short[texW * texH];
        java.util.Arrays.fill(emissivity, MAT_EMISSIVITY);
        java.util.Arrays.fill(owner, MAT);
    }

    /** Texel column whose centre is nearest board x (mm); may lie outside the picture. */
    double u(double xMm) { return (xMm + marginMm) * pxPerMm - 0.5; }

    double v(double yMm) { return (yMm + marginMm) * pxPerMm - 0.5; }

    double xMm(int u) { return (u + 0.5) / pxPerMm - marginMm; }

    double yMm(int v) { return (v + 0.5) / pxPerMm - marginMm; }

    /** Paints the texels whose centres lie in [x0, x1) x [y0, y1) mm; owner unchanged when {@code newOwner} is null. */
    void rect(double x0, double y0, double x1, double y1, double e, Short newOwner) {
        int u0 = Math.max(0, (int) Math.ceil(u(x0))), u1 = Math.min(texW - 1, (int) Math.ceil(u(x1)) - 1);
        int v0 = Math.max(0, (int) Math.ceil(v(y0))), v1 = Math.min(texH - 1, (int) Math.ceil(v(y1)) - 1);
        for (int yy = v0; yy <= v1; yy++)
            for (int xx = u0; xx <= u1; xx++) {
                int i = yy * texW + xx;
                emissivity[i] = (float) e;
                if (newOwner != null) owner[i] = newOwner;
            }
    }

    void disc(double cx, double cy, double r, double e, Short newOwner) {
        int u0 = Math.max(0, (int) Math.floor(u(cx - r))), u1 = Math.min(texW - 1, (int) Math.ceil(u(cx + r)));
        int v0 = Math.max(0, (int) Math.floor(v(cy - r))), v1 = Math.min(texH - 1, (int) Math.ceil(v(cy + r)));
        for (int yy = v0; yy <= v1; yy++)
            for (int xx = u0; xx <= u1; xx++) {
                double dx = xMm(xx) - cx, dy = yMm(yy) - cy;
                if (dx * dx + dy * dy > r * r) continue;
                int i = yy * texW + xx;
                emissivity[i] = (float) e;
                if (newOwner != null) owner[i] = newOwner;
            }
    }

    /** A rectangle outline of line width {@code lineMm} (silkscreen). */
    void frame(double x0, double y0, double x1, double y1, double lineMm, double e) {
        rect(x0, y0, x1, y0 + lineMm, e, null);
        rect(x0, y1 - lineMm, x1, y1, e, null);
        rect(x0, y0, x0 + lineMm, y1, e, null);
        rect(x1 - lineMm, y0, x1, y1, e, null);
    }

    /** Half-extents of a part's keep-out (body plus leads or pads) in x and y. */
    private static double[] keepOut(String kind, double w, double h) {
        return switch (kind) {
            case "ic" -> w >= h ? new double[]{w / 2, h / 2 + 1.0} : new double[]{w / 2 + 1.0, h / 2};
            case "mosfet" -> new double[]{w / 2, h / 2 + 1.3};
            case "inductor" -> new double[]{w / 2 + 0.5, h / 2};
            default -> new double[]{w / 2, h / 2};
        };
    }

    /** A board size in mm, 50-90 wide, 35-65 high, to the half millimetre. */
    static double[] drawSize(SplittableRandom rnd) {
        double w = 50 + 40 * rnd.nextDouble();
        double h = Math.max(35, Math.min(65, w * (0.55 + 0.25 * rnd.nextDouble())));
        return new double[]{Math.round(w * 2) / 2.0, Math.round(h * 2) / 2.0};
    }

    private static final String[] KINDS = {"ic", "capacitor", "inductor", "mosfet", "resistor"};

    /**
     * Draws a w x h mm board with {@code partCount} marked parts (non-overlapping, 2 mm clearance between keep-outs, 3 mm from
     * the edges) and its copper, silkscreen, holes and small unmarked passives, all from {@code rnd}.
     */
    static SpotBoard draw(SplittableRandom rnd, double w, double h, int partCount, double lidChance, double pxPerMm) {
        double mask = 0.86 + 0.06 * rnd.nextDouble();
        SpotBoard b = new SpotBoard(w, h, 5.0, pxPerMm, mask);
        b.rect(0, 0, w, h, mask, BOARD);

        // parts first as rectangles in a list, so traces can run between them before bodies are painted
        record Placed(String kind, double x, double y, double w, double h, double[] keep) {
        }
        List<Placed> placed = new ArrayList<>();
        int tries = 0;
        while (placed.size() < partCount && tries++ < 20000) {
            String kind = KINDS[rnd.nextInt(KINDS.length)];
            double pw, ph;
            switch (kind) {
                case "ic" -> { pw = 3 + 5 * rnd.nextDouble(); ph = Math.max(3, pw * (0.5 + 0.5 * rnd.nextDouble())); }
                case "mosfet" -> { pw = 3 + 3.5 * rnd.nextDouble(); ph = 3 + 3.5 * rnd.nextDouble(); }
                case "inductor" -> { pw = 4 + 4 * rnd.nextDouble(); ph = pw * (0.85 + 0.15 * rnd.nextDouble()); }
                default -> { pw = 2 + 2.5 * rnd.nextDouble(); ph = 1.5 + 1.0 * rnd.nextDouble(); }
            }
            if (rnd.nextBoolean() && !kind.equals("mosfet")) { double t = pw; pw = ph; ph = t; }
            pw = Math.round(pw * 10) / 10.0;
            ph = Math.round(ph * 10) / 10.0;
            double[] keep = keepOut(kind, pw, ph);
            double x = 3 + keep[0] + (w - 6 - 2 * keep[0]) * rnd.nextDouble();
            double y = 3 + keep[1] + (h - 6 - 2 * keep[1]) * rnd.nextDouble();
            x = Math.round(x * 10) / 10.0;
            y = Math.round(y * 10) / 10.0;
            boolean clash = false;
            for (Placed p : placed)
                if (Math.abs(p.x - x) < p.keep[0] + keep[0] + 2 && Math.abs(p.y - y) < p.keep[1] + keep[1] + 2) clash = true;
            // keep the mounting holes (corners, 6 mm square) free
            for (double cx : new double[]{3.5, w - 3.5})
                for (double cy : new double[]{3.5, h - 3.5})
                    if (Math.abs(cx - x) < keep[0] + 3 && Math.abs(cy - y) < keep[1] + 3) clash = true;
            if (!clash) placed.add(new Placed(kind, x, y, pw, ph, keep));
        }
        if (placed.size() < partCount) throw new IllegalStateException("could not place " + partCount + " parts");

        // copper traces between parts: L-shaped, under mask (slightly lower emissivity) or exposed
        int traces = 12 + rnd.nextInt(14);
        for (int t = 0; t < traces; t++) {
            Placed a = placed.get(rnd.nextInt(placed.size())), c = placed.get(rnd.nextInt(placed.size()));
            double half = 0.125 + 0.35 * rnd.nextDouble();
            double e = rnd.nextDouble() < 0.3 ? 0.1 + 0.2 * rnd.nextDouble() : mask - 0.03 - 0.05 * rnd.nextDouble();
            double ex = a == c ? 3 + rnd.nextDouble() * (w - 6) : c.x, ey = a == c ? 3 + rnd.nextDouble() * (h - 6) : c.y;
            b.rect(Math.min(a.x, ex) - half, a.y - half, Math.max(a.x, ex) + half, a.y + half, e, null);
            b.rect(ex - half, Math.min(a.y, ey) - half, ex + half, Math.max(a.y, ey) + half, e, null);
        }
        // an exposed copper rail along one edge
        double rail = 1.5 + rnd.nextDouble();
        double railE = 0.15 + 0.15 * rnd.nextDouble();
        if (rnd.nextBoolean()) b.rect(6, h - 1 - rail, w - 6, h - 1, railE, null);
        else b.rect(1, 6, 1 + rail, h - 6, railE, null);
        // mounting holes: tinned ring, the mat seen through the hole
        for (double cx : new double[]{3.5, w - 3.5})
            for (double cy : new double[]{3.5, h - 3.5}) {
                b.disc(cx, cy, 2.4, 0.12 + 0.1 * rnd.nextDouble(), null);
                b.disc(cx, cy, 1.6, MAT_EMISSIVITY, MAT);
            }
        // fiducials: bare copper dots in a ring of bare laminate
        for (int f = 0; f < 3; f++) {
            double fx = 6 + rnd.nextDouble() * (w - 12), fy = 6 + rnd.nextDouble() * (h - 12);
            boolean free = true;
            for (Placed p : placed)
                if (Math.abs(p.x - fx) < p.keep[0] + 2 && Math.abs(p.y - fy) < p.keep[1] + 2) free = false;
            if (!free) continue;
            b.disc(fx, fy, 1.0, 0.9, null);
            b.disc(fx, fy, 0.5, 0.08 + 0.07 * rnd.nextDouble(), null);
        }
        // small unmarked passives (0402-like): they follow the board temperature
        int small = 10 + rnd.nextInt(16);
        for (int s = 0; s < small; s++) {
            boolean across = rnd.nextBoolean();
            double sw = across ? 1.0 : 0.5, sh = across ? 0.5 : 1.0;
            double sx = 3 + rnd.nextDouble() * (w - 6), sy = 3 + rnd.nextDouble() * (h - 6);
            boolean free = true;
            for (Placed p : placed)
                if (Math.abs(p.x - sx) < p.keep[0] + 1.5 && Math.abs(p.y - sy) < p.keep[1] + 1.5) free = false;
            if (!free) continue;
            b.rect(sx - sw / 2, sy - sh / 2, sx + sw / 2, sy + sh / 2, 0.9, null);
            double cap = 0.08 + 0.1 * rnd.nextDouble();
            if (across) {
                b.rect(sx - 0.5, sy - 0.25, sx - 0.3, sy + 0.25, cap, null);
                b.rect(sx + 0.3, sy - 0.25, sx + 0.5, sy + 0.25, cap, null);
            } else {
                b.rect(sx - 0.25, sy - 0.5, sx + 0.25, sy - 0.3, cap, null);
                b.rect(sx - 0.25, sy + 0.3, sx + 0.25, sy + 0.5, cap, null);
            }
        }

        // marked parts: silkscreen, pads and leads, body
        int[] counter = {1 + rnd.nextInt(5), 1 + rnd.nextInt(20), 1 + rnd.nextInt(5), 1 + rnd.nextInt(9), 1 + rnd.nextInt(30)};
        String[] letter = {"U", "C", "L", "Q", "R"};
        for (int i = 0; i < placed.size(); i++) {
            Placed p = placed.get(i);
            int kindIndex = java.util.Arrays.asList(KINDS).indexOf(p.kind);
            String ref = letter[kindIndex] + counter[kindIndex];
            counter[kindIndex] += 1 + rnd.nextInt(3);
            double x0 = p.x - p.w / 2, x1 = p.x + p.w / 2, y0 = p.y - p.h / 2, y1 = p.y + p.h / 2;
            double silk = 0.94;
            b.frame(x0 - p.keep[0] + p.w / 2 - 0.5, y0 - p.keep[1] + p.h / 2 - 0.5,
                    x1 + p.keep[0] - p.w / 2 + 0.5, y1 + p.keep[1] - p.h / 2 + 0.5, 0.15, silk);
            // designator text as a row of silkscreen dashes above the outline
            double ty = y0 - (p.keep[1] - p.h / 2) - 1.3;
            for (int d = 0; d < 2 + ref.length(); d++)
                if (ty > 0.5) b.rect(x0 + d * 0.6, ty, x0 + d * 0.6 + 0.35, ty + 0.6, silk, null);
            double pad = 0.15 + 0.15 * rnd.nextDouble(), lead = 0.08 + 0.12 * rnd.nextDouble();
            String material;
            double e;
            switch (p.kind) {
                case "ic" -> {
                    boolean rowsAlongX = p.w >= p.h;
                    double pitch = 0.65 + 0.6 * rnd.nextDouble();
                    double len = rowsAlongX ? p.w : p.h;
                    int n = Math.max(2, (int) ((len - 0.6) / pitch));
                    for (int k = 0; k < n; k++) {
                        double at = -len / 2 + 0.3 + (k + 0.5) * (len - 0.6) / n;
                        for (int side = -1; side <= 1; side += 2) {
                            if (rowsAlongX) {
                                double yEdge = p.y + side * p.h / 2;
                                b.rect(p.x + at - 0.2, Math.min(yEdge, yEdge + side * 1.0), p.x + at + 0.2,
                                        Math.max(yEdge, yEdge + side * 1.0), pad, null);
                                b.rect(p.x + at - 0.13, Math.min(yEdge, yEdge + side * 0.8), p.x + at + 0.13,
                                        Math.max(yEdge, yEdge + side * 0.8), lead, null);
                            } else {
                                double xEdge = p.x + side * p.w / 2;
                                b.rect(Math.min(xEdge, xEdge + side * 1.0), p.y + at - 0.2,
                                        Math.max(xEdge, xEdge + side * 1.0), p.y + at + 0.2, pad, null);
                                b.rect(Math.min(xEdge, xEdge + side * 0.8), p.y + at - 0.13,
                                        Math.max(xEdge, xEdge + side * 0.8), p.y + at + 0.13, lead, null);
                            }
                        }
                    }
                    material = "epoxy moulded package";
                    e = 0.92;
                }
                case "mosfet" -> {
                    // three leads below, a wide tab pad above (partly under the body)
                    for (int k = -1; k <= 1; k++) {
                        double lx = p.x + k * p.w / 3;
                        b.rect(lx - 0.3, y1, lx + 0.3, y1 + 1.3, pad, null);
                        b.rect(lx - 0.2, y1, lx + 0.2, y1 + 1.0, lead, null);
                    }
                    b.rect(x0 - 0.3, y0 - 1.0, x1 + 0.3, y0 + 0.8, pad, null);
                    material = "epoxy moulded package";
                    e = 0.92;
                }
                case "inductor" -> {
                    boolean padsX = rnd.nextBoolean();
                    if (padsX) {
                        b.rect(x0 - 0.5, y0 + 0.15 * p.h, x0 + 0.8, y1 - 0.15 * p.h, pad, null);
                        b.rect(x1 - 0.8, y0 + 0.15 * p.h, x1 + 0.5, y1 - 0.15 * p.h, pad, null);
                    } else {
                        b.rect(x0 + 0.15 * p.w, y0 - 0.5, x1 - 0.15 * p.w, y0 + 0.8, pad, null);
                        b.rect(x0 + 0.15 * p.w, y1 - 0.8, x1 - 0.15 * p.w, y1 + 0.5, pad, null);
                    }
                    material = "epoxy moulded package";
                    e = 0.92;
                }
                case "capacitor" -> {
                    material = "ceramic capacitor body";
                    e = 0.90;
                }
                default -> {
                    material = null;
                    e = 0.94;
                }
            }
            boolean lid = (p.kind.equals("mosfet") || p.kind.equals("ic") || p.kind.equals("inductor"))
                    && rnd.nextDouble() < lidChance;
            if (lid) {
                material = "nickel-plated metal lid";
                e = 0.10;
            }
            b.rect(x0, y0, x1, y1, e, (short) i);
            if (p.kind.equals("capacitor") || p.kind.equals("resistor")) {
                // metal end caps, a fifth of the length at each end, part of the body
                double cap = 0.08 + 0.1 * rnd.nextDouble();
                if (p.w >= p.h) {
                    b.rect(x0, y0, x0 + 0.2 * p.w, y1, cap, null);
                    b.rect(x1 - 0.2 * p.w, y0, x1, y1, cap, null);
                } else {
                    b.rect(x0, y0, x1, y0 + 0.2 * p.h, cap, null);
                    b.rect(x0, y1 - 0.2 * p.h, x1, y1, cap, null);
                }
            }
            b.parts.add(new PartLayout(ref, p.kind, material, p.x, p.y, p.w, p.h, e));
        }
        return b;
    }
}
