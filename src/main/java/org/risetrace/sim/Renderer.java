package org.risetrace.sim;


import org.risetrace.registration.Homography;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;

/**
 * Renders what the camera sees: a board-space texture (parts, leads, silkscreen, exposed copper, holes, solder
 * mask) carrying object temperature and emissivity, turned into apparent temperature per material, resampled into
 * each frame through the frame's homography with sub-pixel supersampling (box average over the pixel), blurred by
 * a Gaussian point-spread function, then given fixed-pattern and temporal noise.
 *
 * <p>The blur is applied to apparent temperature rather than radiance: over the few tens of kelvin of a bench
 * scene the band radiance is close to linear in temperature, so the difference is small.
 */
final class Renderer {
    static final byte MODE_BOARD = 0, MODE_PART = 1, MODE_LEAD = 2, MODE_MAT = 3;

    private final Scenario s;
    private final BoardModel bm;
    final int tw, th;
    final double texelMm;
    private final byte[] mode;
    private final byte[] cls;
    private final short[] owner;
    private final List<Double> classEmissivity = new ArrayList<>();
    private ApparentTable[] tables;
    private final int matClass;
    private final float[] fixedPattern;
    private final float[] kernel;
    final int width, height;

    Renderer(Scenario s, BoardModel bm) {
        this.s = s;
        this.bm = bm;
        Scenario.CameraSpec c = s.camera();
        width = c.width();
        height = c.height();
        Scenario.BoardSpec b = s.board();
        double pxPerMm = c.focalPx() / c.distanceMm() * (1 + c.motionOrDefault().scaleOrDefault());
        texelMm = Math.max(0.03, Math.min(0.5, 1.0 / (3.0 * pxPerMm)));
        tw = (int) Math.ceil(b.widthMm() / texelMm);
        th = (int) Math.ceil(b.heightMm() / texelMm);
        mode = new byte[tw * th];
        cls = new byte[tw * th];
        owner = new short[tw * th];
        int mask = classOf(b.maskEmissivityOrDefault());
        int silk = classOf(b.silkEmissivityOrDefault());
        int tinned = classOf(Materials.TINNED_LEAD_EMISSIVITY);
        matClass = classOf(c.backgroundEmissivityOrDefault());
        List<Scenario.PartSpec> parts = bm.parts;
        int[] bodyClass = new int[parts.size()], leadClass = new int[parts.size()];
        for (int p = 0; p < parts.size(); p++) {
            bodyClass[p] = classOf(parts.get(p).emissivityOrDefault());
            leadClass[p] = classOf(parts.get(p).leadEmissivityOrDefault());
        }
        double dx = b.widthMm() / tw, dy = b.heightMm() / th;
        java.util.Arrays.fill(cls, (byte) mask);
        java.util.Arrays.fill(owner, (short) -1);
        for (Scenario.TraceSpec tr : b.tracesOrEmpty()) {
            if (!tr.exposedOrFalse()) continue;
            double[] bb = bounds(tr);
            forBox(bb, dx, dy, (t, x, y) -> {
                if (tr.distanceMm(x, y) <= tr.widthMm() / 2) cls[t] = (byte) tinned;
            });
        }
        for (Scenario.PartSpec p : parts) {
            // silkscreen: a 0.15 mm line drawn 0.3 mm outside each part's outline (common practice in layouts)
            double ca = Math.cos(Math.toRadians(p.rotationOrZero())), sa = Math.sin(Math.toRadians(p.rotationOrZero()));
            double r = 0.5 * Math.hypot(p.wMm(), p.hMm()) + 0.5;
            forBox(new double[]{p.xMm() - r, p.yMm() - r, p.xMm() + r, p.yMm() + r}, dx, dy, (t, x, y) -> {
                double ddx = x - p.xMm(), ddy = y - p.yMm();
                double u = ddx * ca - ddy * sa, v = ddx * sa + ddy * ca;
                double outside = Math.max(Math.abs(u) - (p.wMm() / 2 + 0.3), Math.abs(v) - (p.hMm() / 2 + 0.3));
                if (outside <= 0 && outside >= -0.15) cls[t] = (byte) silk;
            });
        }
        for (int pi = 0; pi < parts.size(); pi++) {
            final int p = pi;
            Scenario.PartSpec part = parts.get(p);
            double ca = Math.cos(Math.toRadians(part.rotationOrZero())), sa = Math.sin(Math.toRadians(part.rotationOrZero()));
            double r = 0.5 * Math.hypot(part.wMm(), part.hMm());
            double hw = part.wMm() / 2, hh = part.hMm() / 2;
            String leads = part.leadsOrDefault();
            double cap = Math.max(Math.min(0.22 * part.wMm(), 1.5), texelMm);
            double band = Math.max(0.18 * part.hMm(), texelMm);
            double pitch = part.wMm() > 4 ? 1.27 : 0.65;
            forBox(new double[]{part.xMm() - r, part.yMm() - r, part.xMm() + r, part.yMm() + r}, dx, dy, (t, x, y) -> {
                double ddx = x - part.xMm(), ddy = y - part.yMm();
                double u = ddx * ca - ddy * sa, v = ddx * sa + ddy * ca;
                if (Math.abs(u) > hw || Math.abs(v) > hh) return;
                byte m = MODE_PART;
                int k = bodyClass[p];
                int own = p;
                if (leads.equals("ends") && Math.abs(u) > hw - cap) {
                    m = MODE_LEAD;
                    k = leadClass[p];
                } else if (leads.equals("sides") && Math.abs(v) > hh - band) {
                    double pos = (u + hw) / pitch;
                    double frac = pos - Math.floor(pos);
                    if (frac > 0.25 && frac < 0.75) {
                        m = MODE_LEAD;
                        k = leadClass[p];
                    } else {
                        return; // board between gull-wing leads
                    }
                }
                mode[t] = m;
                cls[t] = (byte) k;
                owner[t] = (short) own;
            });
        }
        for (Scenario.HoleSpec hole : b.holesOrEmpty()) {
            double r = hole.diameterMm() / 2 + hole.ringOrDefault();
            forBox(new double[]{hole.xMm() - r, hole.yMm() - r, hole.xMm() + r, hole.yMm() + r}, dx, dy, (t, x, y) -> {
                double rr = Math.hypot(x - hole.xMm(), y - hole.yMm());
                if (rr <= hole.diameterMm() / 2) {
                    mode[t] = MODE_MAT; cls[t] = (byte) matClass; owner[t] = -1;
                } else if (rr <= r) {
                    mode[t] = MODE_BOARD; cls[t] = (byte) tinned; owner[t] = -1;
                }
            });
        }
        SplittableRandom rnd = new SplittableRandom(s.seed() ^ 0x66697865645F7074L);
        fixedPattern = new float[width * height];
        double fpn = c.fixedPatternOrDefault();
        for (int i = 0; i < fixedPattern.length; i++) fixedPattern[i] = (float) (fpn * rnd.nextGaussian());
        double sigma = c.blurOrDefault();
        if (sigma > 0) {
            int rad = (int) Math.ceil(3 * sigma);
            kernel = new float[2 * rad + 1];
            double sum = 0;
            for (int i = -rad; i <= rad; i++) sum += Math.exp(-0.5 * i * i / (sigma * sigma));
            for (int i = -rad; i <= rad; i++) kernel[i + rad] = (float) (Math.exp(-0.5 * i * i / (sigma * sigma)) / sum);
        } else {
            kernel = null;
        }
    }

    private interface TexelVisitor {
        void visit(int texel, double xMm, double yMm);
    }

    private void forBox(double[] bb, double dx, double dy, TexelVisitor v) {
        int i0 = Math.max(0, (int) Math.floor(bb[0] / dx)), i1 = Math.min(tw - 1, (int) Math.floor(bb[2] / dx));
        int j0 = Math.max(0, (int) Math.floor(bb[1] / dy)), j1 = Math.min(th - 1, (int) Math.floor(bb[3] / dy));
        for (int j = j0; j <= j1; j++)
            for (int i = i0; i <= i1; i++) v.visit(j * tw + i, (i + 0.5) * dx, (j + 0.5) * dy);
    }

    private static double[] bounds(Scenario.TraceSpec t) {
        double x0 = Double.POSITIVE_INFINITY, y0 = x0, x1 = Double.NEGATIVE_INFINITY, y1 = x1;
        for (double[] pt : t.pointsMm()) {
            x0 = Math.min(x0, pt[0]); y0 = Math.min(y0, pt[1]);
            x1 = Math.max(x1, pt[0]); y1 = Math.max(y1, pt[1]);
        }
        return new double[]{x0 - t.widthMm(), y0 - t.widthMm(), x1 + t.widthMm(), y1 + t.widthMm()};
    }

    private int classOf(double e) {
        int i = classEmissivity.indexOf(e);
        if (i >= 0) return i;
        classEmissivity.add(e);
        if (classEmissivity.size() > 120) throw new IllegalArgumentException("too many distinct emissivities");
        return classEmissivity.size() - 1;
    }

    /** Builds the apparent-temperature tables over [loC, hiC] of object temperature. */
    void prepare(double loC, double hiC) {
        double refl = s.reflectedCOrDefault();
        double lo = Math.min(loC, refl) - 2, hi = Math.max(hiC, refl) + 2;
        tables = new ApparentTable[classEmissivity.size()];
        for (int k = 0; k < tables.length; k++)
            tables[k] = new ApparentTable(classEmissivity.get(k), refl, s.camera().bandOrDefault(), lo, hi);
    }

    /** Per-thread scratch buffers. */
    final class Buffers {
        final float[] texApparent = new float[tw * th];
        final float[] image = new float[width * height];
        final float[] tmp = new float[width * height];
    }

    Buffers buffers() { return new Buffers(); }

    /**
     * Renders one frame into {@code buf.image}: apparent temperature in degrees Celsius with noise.
     *
     * @param cellsC    board cell temperatures
     * @param partsC    part node temperatures
     * @param ambientC  room temperature (the bench mat's temperature)
     * @param boardToFrame homography board mm to frame px
     * @param noiseSeed seed of this frame's temporal noise
     */
    void render(float[] cellsC, double[] partsC, double ambientC, Homography boardToFrame, long noiseSeed, Buffers buf) {
        Scenario.BoardSpec b = s.board();
        double dx = b.widthMm() / tw, dy = b.heightMm() / th;
        float[] tex = buf.texApparent;
        for (int j = 0; j < th; j++) {
            double y = (j + 0.5) * dy;
            for (int i = 0; i < tw; i++) {
                int t = j * tw + i;
                double obj;
                switch (mode[t]) {
                    case MODE_PART -> obj = partsC[owner[t]];
                    case MODE_LEAD -> obj = 0.5 * (partsC[owner[t]]
                            + BoardModel.boardAt(cellsC, bm.nx, bm.ny, bm.dxMm, bm.dyMm, (i + 0.5) * dx, y));
                    case MODE_MAT -> obj = ambientC;
                    default -> obj = BoardModel.boardAt(cellsC, bm.nx, bm.ny, bm.dxMm, bm.dyMm, (i + 0.5) * dx, y);
                }
                tex[t] = (float) tables[cls[t]].apply(obj);
            }
        }
        float matApparent = (float) tables[matClass].apply(ambientC);
        double[] h = boardToFrame.inverse().values();
        int ss = s.camera().supersampleOrDefault();
        double wMm = b.widthMm(), hMm = b.heightMm();
        float[] img = buf.image;
        double inv = 1.0 / (ss * ss);
        for (int py = 0; py < height; py++) {
            for (int px = 0; px < width; px++) {
                double acc = 0;
                for (int sj = 0; sj < ss; sj++) {
                    double v = py - 0.5 + (sj + 0.5) / ss;
                    for (int si = 0; si < ss; si++) {
                        double u = px - 0.5 + (si + 0.5) / ss;
                        double w = h[6] * u + h[7] * v + h[8];
                        double xm = (h[0] * u + h[1] * v + h[2]) / w, ym = (h[3] * u + h[4] * v + h[5]) / w;
                        if (xm < 0 || ym < 0 || xm >= wMm || ym >= hMm) {
                            acc += matApparent;
                        } else {
                            double fx = xm / dx - 0.5, fy = ym / dy - 0.5;
                            if (fx < 0) fx = 0;
                            if (fy < 0) fy = 0;
                            if (fx > tw - 1) fx = tw - 1;
                            if (fy > th - 1) fy = th - 1;
                            int i = Math.min((int) fx, Math.max(0, tw - 2)), j = Math.min((int) fy, Math.max(0, th - 2));
                            double ax = fx - i, ay = fy - j;
                            int i1 = Math.min(i + 1, tw - 1), j1 = Math.min(j + 1, th - 1);
                            acc += (1 - ay) * ((1 - ax) * tex[j * tw + i] + ax * tex[j * tw + i1])
                                    + ay * ((1 - ax) * tex[j1 * tw + i] + ax * tex[j1 * tw + i1]);
                        }
                    }
                }
                img[py * width + px] = (float) (acc * inv);
            }
        }
        if (kernel != null) blur(img, buf.tmp);
        SplittableRandom rnd = new SplittableRandom(noiseSeed);
        double netd = s.camera().netdOrDefault();
        for (int i = 0; i < img.length; i++) img[i] = (float) (img[i] + fixedPattern[i] + netd * rnd.nextGaussian());
    }

    /** Separable Gaussian convolution with clamped borders. */
    private void blur(float[] img, float[] tmp) {
        int rad = kernel.length / 2;
        for (int y = 0; y < height; y++) {
            int row = y * width;
            for (int x = 0; x < width; x++) {
                double acc = 0;
                for (int k = -rad; k <= rad; k++) {
                    int xx = Math.max(0, Math.min(width - 1, x + k));
                    acc += kernel[k + rad] * img[row + xx];
                }
                tmp[row + x] = (float) acc;
            }
        }
        for (int y = 0; y < height; y++) {
            for (int x = 0; x < width; x++) {
                double acc = 0;
                for (int k = -rad; k <= rad; k++) {
                    int yy = Math.max(0, Math.min(height - 1, y + k));
                    acc += kernel[k + rad] * tmp[yy * width + x];
                }
                img[y * width + x] = (float) acc;
            }
        }
    }
}
