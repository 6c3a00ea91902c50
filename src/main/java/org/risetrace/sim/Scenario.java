package org.risetrace.sim;

import com.fasterxml.jackson.annotation.JsonIgnoreProperties;
import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonMappingException;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.exc.UnrecognizedPropertyException;
import org.risetrace.frame.InputRejected;
import org.risetrace.io.write.FrameEncoding;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Set;

/**
 * A scenario file: the board, its fault, the injection, the camera and the frame timing, with the random seed.
 * Every field is documented in the README ("Scenario files"). Optional fields are null and take the defaults
 * given by the {@code ...OrDefault} accessors.
 *
 * @param name     scenario name (free text, goes into the sidecar's notes)
 * @param seed     random seed: same scenario and seed give the same bytes
 * @param board    the board and its parts
 * @param fault    where the injected power is dissipated
 * @param injection the injection record written to series.json
 * @param camera   camera pose, motion, optics, noise and export encoding
 * @param frames   frame count and timing
 * @param ambient  room temperature and its drift
 * @param marked   designators written into board.json (null: every part)
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
@JsonIgnoreProperties(ignoreUnknown = false)
public record Scenario(
        @JsonProperty("name") String name,
        @JsonProperty("seed") long seed,
        @JsonProperty("board") BoardSpec board,
        @JsonProperty("fault") Fault fault,
        @JsonProperty("injection") InjectionSpec injection,
        @JsonProperty("camera") CameraSpec camera,
        @JsonProperty("frames") Timing frames,
        @JsonProperty("ambient") AmbientSpec ambient,
        @JsonProperty("marked") List<String> marked) {

    static final ObjectMapper JSON = org.risetrace.frame.StrictJson.builder()
            .enable(DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES)
            .disable(DeserializationFeature.FAIL_ON_NULL_FOR_PRIMITIVES).build();

    /**
     * The board: size, laminate, copper, surface loss and the parts.
     *
     * @param name             board name written to board.json
     * @param sizeMm           [width, height] mm
     * @param thicknessMm      laminate thickness (default 1.6 mm, common practice)
     * @param copperLayers     copper planes with their thickness and fill fraction (default two 35 um layers at 0.4)
     * @param cellMm           thermal grid cell size (default 1 mm)
     * @param hConvWPerM2K     convective film coefficient of each face (default 10 W/m^2K; 5-15 for still air)
     * @param maskEmissivity   solder mask emissivity (default 0.90)
     * @param silkEmissivity   silkscreen ink emissivity (default 0.88)
     * @param initial          "ambient" (default) or "idle-steady" (steady state under the parts' idle power)
     * @param parts            the parts
     * @param traces           copper tracks (thermal conduction; exposed ones show as low emissivity)
     * @param holes            mounting holes (plated ring, the bench mat seen through the hole)
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record BoardSpec(
            @JsonProperty("name") String name,
            @JsonProperty("size_mm") double[] sizeMm,
            @JsonProperty("thickness_mm") Double thicknessMm,
            @JsonProperty("copper_layers") List<CopperLayer> copperLayers,
            @JsonProperty("cell_mm") Double cellMm,
            @JsonProperty("h_conv_w_per_m2k") Double hConvWPerM2K,
            @JsonProperty("mask_emissivity") Double maskEmissivity,
            @JsonProperty("silk_emissivity") Double silkEmissivity,
            @JsonProperty("initial") String initial,
            @JsonProperty("parts") List<PartSpec> parts,
            @JsonProperty("traces") List<TraceSpec> traces,
            @JsonProperty("holes") List<HoleSpec> holes) {
        public double widthMm() { return sizeMm[0]; }
        public double heightMm() { return sizeMm[1]; }
        public double thicknessOrDefault() { return thicknessMm == null ? 1.6 : thicknessMm; }
        public List<CopperLayer> copperOrDefault() {
            return copperLayers == null ? List.of(new CopperLayer(35.0, 0.4), new CopperLayer(35.0, 0.4)) : copperLayers;
        }
        public double cellOrDefault() { return cellMm == null ? 1.0 : cellMm; }
        public double hConvOrDefault() { return hConvWPerM2K == null ? 10.0 : hConvWPerM2K; }
        public double maskEmissivityOrDefault() { return maskEmissivity == null ? Materials.SOLDER_MASK_EMISSIVITY : maskEmissivity; }
        public double silkEmissivityOrDefault() { return silkEmissivity == null ? Materials.SILKSCREEN_EMISSIVITY : silkEmissivity; }
        public String initialOrDefault() { return initial == null ? "ambient" : initial; }
        public List<PartSpec> partsOrEmpty() { return parts == null ? List.of() : parts; }
        public List<TraceSpec> tracesOrEmpty() { return traces == null ? List.of() : traces; }
        public List<HoleSpec> holesOrEmpty() { return holes == null ? List.of() : holes; }

        public BoardSpec withParts(List<PartSpec> newParts) {
            return new BoardSpec(name, sizeMm, thicknessMm, copperLayers, cellMm, hConvWPerM2K, maskEmissivity,
                    silkEmissivity, initial, newParts, traces, holes);
        }
        public BoardSpec withCellMm(double cell) {
            return new BoardSpec(name, sizeMm, thicknessMm, copperLayers, cell, hConvWPerM2K, maskEmissivity,
                    silkEmissivity, initial, parts, traces, holes);
        }
    }

    /** A copper layer: thickness in micrometres (35 um = 1 oz, common practice) and the fraction of area it covers. */
    public record CopperLayer(@JsonProperty("thickness_um") double thicknessUm, @JsonProperty("fill") double fill) {
    }

    /**
     * A part, a rectangle on the top face.
     *
     * @param ref              designator
     * @param kind             free word written to board.json (mosfet, inductor, capacitor, ic, resistor ...)
     * @param material         material name written to board.json (for the radiometry stage), optional
     * @param xMm              centre x
     * @param yMm              centre y
     * @param wMm              size along the part's x axis
     * @param hMm              size along the part's y axis
     * @param rotationDeg      counter-clockwise rotation in the board's x-right, y-down frame
     * @param heightMm         body height above the board (default 1 mm), for the heat capacity
     * @param heatCapacityJPerK lumped heat capacity (default: body volume times the kind's volumetric heat capacity)
     * @param contactWPerK     thermal conductance part to board (default footprint area times 2000 W/m^2K)
     * @param emissivity       emissivity of the body's top face (default: by kind)
     * @param leads            "ends" (terminations at both short ends), "sides" (gull-wing leads along the long sides) or "none"
     * @param leadEmissivity   emissivity of the leads (default tinned, 0.2)
     * @param idlePowerW       power dissipated without injection (default 0)
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record PartSpec(
            @JsonProperty("ref") String ref,
            @JsonProperty("kind") String kind,
            @JsonProperty("material") String material,
            @JsonProperty("x_mm") double xMm,
            @JsonProperty("y_mm") double yMm,
            @JsonProperty("w_mm") double wMm,
            @JsonProperty("h_mm") double hMm,
            @JsonProperty("rotation_deg") Double rotationDeg,
            @JsonProperty("height_mm") Double heightMm,
            @JsonProperty("heat_capacity_j_per_k") Double heatCapacityJPerK,
            @JsonProperty("contact_w_per_k") Double contactWPerK,
            @JsonProperty("emissivity") Double emissivity,
            @JsonProperty("leads") String leads,
            @JsonProperty("lead_emissivity") Double leadEmissivity,
            @JsonProperty("idle_power_w") Double idlePowerW) {
        public double rotationOrZero() { return rotationDeg == null ? 0.0 : rotationDeg; }
        public double heightOrDefault() { return heightMm == null ? 1.0 : heightMm; }
        public double areaM2() { return wMm * hMm * 1e-6; }
        public double heatCapacityOrDefault() {
            return heatCapacityJPerK != null ? heatCapacityJPerK
                    : Materials.volumetricHeatCapacity(kind) * wMm * hMm * heightOrDefault() * 1e-9;
        }
        public double contactOrDefault() {
            return contactWPerK != null ? contactWPerK : areaM2() * Materials.CONTACT_W_PER_M2K;
        }
        public double emissivityOrDefault() { return emissivity != null ? emissivity : Materials.bodyEmissivity(kind); }
        public String leadsOrDefault() { return leads == null ? "none" : leads; }
        public double leadEmissivityOrDefault() { return leadEmissivity == null ? Materials.TINNED_LEAD_EMISSIVITY : leadEmissivity; }
        public double idlePowerOrZero() { return idlePowerW == null ? 0.0 : idlePowerW; }

        public PartSpec withCentre(double x, double y) {
            return new PartSpec(ref, kind, material, x, y, wMm, hMm, rotationDeg, heightMm, heatCapacityJPerK,
                    contactWPerK, emissivity, leads, leadEmissivity, idlePowerW);
        }
        public PartSpec withEmissivity(double e) {
            return new PartSpec(ref, kind, material, xMm, yMm, wMm, hMm, rotationDeg, heightMm, heatCapacityJPerK,
                    contactWPerK, e, leads, leadEmissivity, idlePowerW);
        }

        /** True when board point (x, y) mm lies inside the rectangle; writes the part-frame coordinates to uv. */
        boolean containsLocal(double x, double y, double[] uv) {
            double a = Math.toRadians(rotationOrZero());
            double dx = x - xMm, dy = y - yMm;
            double u = dx * Math.cos(a) - dy * Math.sin(a);
            double v = dx * Math.sin(a) + dy * Math.cos(a);
            if (uv != null) { uv[0] = u; uv[1] = v; }
            return Math.abs(u) <= wMm / 2 && Math.abs(v) <= hMm / 2;
        }
    }

    /**
     * A copper track as a polyline.
     *
     * @param ref          name, so that a fault source can put power into it (a current path's copper)
     * @param pointsMm     vertices [[x, y], ...] mm
     * @param widthMm      track width
     * @param thicknessUm  copper thickness (default 35 um)
     * @param exposed      true for bare (unmasked, tinned) copper, which shows as low emissivity
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record TraceSpec(
            @JsonProperty("ref") String ref,
            @JsonProperty("points_mm") double[][] pointsMm,
            @JsonProperty("width_mm") double widthMm,
            @JsonProperty("thickness_um") Double thicknessUm,
            @JsonProperty("exposed") Boolean exposed) {
        public double thicknessOrDefault() { return thicknessUm == null ? 35.0 : thicknessUm; }
        public boolean exposedOrFalse() { return exposed != null && exposed; }

        /** Distance from (x, y) to the polyline, mm. */
        double distanceMm(double x, double y) {
            double best = Double.POSITIVE_INFINITY;
            for (int i = 0; i + 1 < pointsMm.length; i++) {
                double ax = pointsMm[i][0], ay = pointsMm[i][1], bx = pointsMm[i + 1][0], by = pointsMm[i + 1][1];
                double vx = bx - ax, vy = by - ay, len2 = vx * vx + vy * vy;
                double s = len2 == 0 ? 0 : Math.max(0, Math.min(1, ((x - ax) * vx + (y - ay) * vy) / len2));
                double ex = ax + s * vx - x, ey = ay + s * vy - y;
                best = Math.min(best, Math.sqrt(ex * ex + ey * ey));
            }
            return best;
        }

        double lengthMm() {
            double l = 0;
            for (int i = 0; i + 1 < pointsMm.length; i++)
                l += Math.hypot(pointsMm[i + 1][0] - pointsMm[i][0], pointsMm[i + 1][1] - pointsMm[i][1]);
            return l;
        }
    }

    /** A plated mounting hole: centre, drill diameter, width of the tinned ring around it. */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record HoleSpec(@JsonProperty("x_mm") double xMm, @JsonProperty("y_mm") double yMm,
                           @JsonProperty("diameter_mm") double diameterMm, @JsonProperty("ring_mm") Double ringMm) {
        public double ringOrDefault() { return ringMm == null ? 0.8 : ringMm; }
    }

    /**
     * The fault.
     *
     * @param sources  where the power goes: parts or traces by ref, each with its share (shares sum to 1)
     * @param powerW   total power while the supply is on
     * @param waveform "step" (on from the injection start) or "square" (on/off with period and duty, for lock-in)
     * @param periodS  square-wave period
     * @param duty     square-wave on fraction (default 0.5)
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record Fault(
            @JsonProperty("sources") List<SourceShare> sources,
            @JsonProperty("power_w") double powerW,
            @JsonProperty("waveform") String waveform,
            @JsonProperty("period_s") Double periodS,
            @JsonProperty("duty") Double duty) {
        public String waveformOrDefault() { return waveform == null ? "step" : waveform; }
        public double dutyOrDefault() { return duty == null ? 0.5 : duty; }
        public List<SourceShare> sourcesOrEmpty() { return sources == null ? List.of() : sources; }
    }

    /** A share of the fault power dissipated in a part or trace. */
    public record SourceShare(@JsonProperty("ref") String ref, @JsonProperty("share") double share) {
    }

    /** The injection record for series.json (see {@link org.risetrace.io.Sidecar.Injection}); the start comes from frames. */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record InjectionSpec(
            @JsonProperty("from_rail") String fromRail,
            @JsonProperty("to_rail") String toRail,
            @JsonProperty("volts") Double volts,
            @JsonProperty("current_limit_a") Double currentLimitA,
            @JsonProperty("supply") String supply,
            @JsonProperty("notes") String notes) {
    }

    /**
     * The camera.
     *
     * @param width          pixels
     * @param height         pixels
     * @param focalPx        focal length in pixels
     * @param distanceMm     distance from the lens to the board centre
     * @param tiltDeg        tilt of the optical axis away from the board normal
     * @param tiltAxisDeg    direction, in the board plane, of the axis the camera tilts about (0 = board x)
     * @param rotationDeg    in-plane rotation of the board in the image
     * @param offsetPx       where the board centre lands relative to the image centre, [dx, dy] px
     * @param motion         per-frame motion
     * @param blurSigmaPx    Gaussian point-spread sigma in pixels (default 0.7)
     * @param netdK          temporal noise, standard deviation in kelvin (default 0.05)
     * @param fixedPatternK  fixed-pattern per-pixel offset, standard deviation in kelvin (default 0.02)
     * @param bandUm         spectral band (default [7.5, 14] um, uncooled microbolometer, common practice)
     * @param encoding       u16-centikelvin-png, u16-centikelvin-tiff, f32-tiff or u8-span-png
     * @param spanC          fixed [low, high] for u8-span-png
     * @param autoSpan       u8-span-png: each frame's span from its own min and max (recorded per frame in series.json)
     * @param supersample    sub-samples per pixel side (default 3)
     * @param backgroundEmissivity emissivity of the bench mat outside the board (default 0.95)
     * @param reflectedC     reflected apparent temperature (default: ambient at the start)
     * @param exifStart      when set (ISO-8601 instant), TIFF frames carry EXIF DateTimeOriginal + SubSecTimeOriginal from it
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record CameraSpec(
            @JsonProperty("width") int width,
            @JsonProperty("height") int height,
            @JsonProperty("focal_px") double focalPx,
            @JsonProperty("distance_mm") double distanceMm,
            @JsonProperty("tilt_deg") Double tiltDeg,
            @JsonProperty("tilt_axis_deg") Double tiltAxisDeg,
            @JsonProperty("rotation_deg") Double rotationDeg,
            @JsonProperty("offset_px") double[] offsetPx,
            @JsonProperty("motion") Motion motion,
            @JsonProperty("blur_sigma_px") Double blurSigmaPx,
            @JsonProperty("netd_k") Double netdK,
            @JsonProperty("fixed_pattern_k") Double fixedPatternK,
            @JsonProperty("band_um") double[] bandUm,
            @JsonProperty("encoding") String encoding,
            @JsonProperty("span_c") double[] spanC,
            @JsonProperty("auto_span") Boolean autoSpan,
            @JsonProperty("supersample") Integer supersample,
            @JsonProperty("background_emissivity") Double backgroundEmissivity,
            @JsonProperty("reflected_c") Double reflectedC,
            @JsonProperty("exif_start") String exifStart) {
        public double tiltOrZero() { return tiltDeg == null ? 0 : tiltDeg; }
        public double tiltAxisOrZero() { return tiltAxisDeg == null ? 0 : tiltAxisDeg; }
        public double rotationOrZero() { return rotationDeg == null ? 0 : rotationDeg; }
        public double[] offsetOrZero() { return offsetPx == null ? new double[]{0, 0} : offsetPx; }
        public Motion motionOrDefault() { return motion == null ? Motion.stand(0.0) : motion; }
        public double blurOrDefault() { return blurSigmaPx == null ? 0.7 : blurSigmaPx; }
        public double netdOrDefault() { return netdK == null ? 0.05 : netdK; }
        public double fixedPatternOrDefault() { return fixedPatternK == null ? 0.02 : fixedPatternK; }
        public double[] bandOrDefault() { return bandUm == null ? new double[]{7.5, 14.0} : bandUm; }
        public FrameEncoding encodingOrDefault() {
            return encoding == null ? FrameEncoding.U16_CENTIKELVIN_PNG : FrameEncoding.byId(encoding);
        }
        public boolean autoSpanOrFalse() { return autoSpan != null && autoSpan; }
        public int supersampleOrDefault() { return supersample == null ? 3 : supersample; }
        public double backgroundEmissivityOrDefault() {
            return backgroundEmissivity == null ? Materials.BENCH_MAT_EMISSIVITY : backgroundEmissivity;
        }

        CameraSpec with(int w, int h, double f, Motion m, Double netd, String enc, Double fpn, Double blur) {
            return new CameraSpec(w, h, f, distanceMm, tiltDeg, tiltAxisDeg, rotationDeg, offsetPx, m, blur, netd, fpn,
                    bandUm, enc, spanC, autoSpan, supersample, backgroundEmissivity, reflectedC, exifStart);
        }
    }

    /**
     * Per-frame camera motion relative to the first frame's pose.
     *
     * @param kind             "stand" (slow sub-pixel drift) or "handheld" (independent random similarity per frame)
     * @param driftPx          stand: random-walk step per frame, px (default 0.03)
     * @param rotationDeg      handheld: rotation drawn uniformly in +-this (default 5)
     * @param scale            handheld: scale drawn uniformly in 1 +- this (default 0.10)
     * @param translationFrac  handheld: translation drawn uniformly in +- this fraction of the width (default 0.15)
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record Motion(
            @JsonProperty("kind") String kind,
            @JsonProperty("drift_px") Double driftPx,
            @JsonProperty("rotation_deg") Double rotationDeg,
            @JsonProperty("scale") Double scale,
            @JsonProperty("translation_frac") Double translationFrac) {
        public static Motion stand(double driftPx) { return new Motion("stand", driftPx, null, null, null); }
        public static Motion handheld(double rotationDeg, double scale, double translationFrac) {
            return new Motion("handheld", null, rotationDeg, scale, translationFrac);
        }
        public boolean handheldKind() { return "handheld".equals(kind); }
        public double driftOrDefault() { return driftPx == null ? 0.03 : driftPx; }
        public double rotationOrDefault() { return rotationDeg == null ? 5.0 : rotationDeg; }
        public double scaleOrDefault() { return scale == null ? 0.10 : scale; }
        public double translationOrDefault() { return translationFrac == null ? 0.15 : translationFrac; }
    }

    /**
     * Frame timing.
     *
     * @param count           number of frames
     * @param intervalS       seconds between frames
     * @param injectionStartS when the supply is switched on, series seconds
     * @param timeStepS       thermal time step (default 0.25 s; independent of the frame interval)
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record Timing(
            @JsonProperty("count") int count,
            @JsonProperty("interval_s") double intervalS,
            @JsonProperty("injection_start_s") double injectionStartS,
            @JsonProperty("time_step_s") Double timeStepS) {
        public double timeStepOrDefault() { return timeStepS == null ? 0.25 : timeStepS; }
    }

    /** Room temperature at the start and its slow drift. */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record AmbientSpec(@JsonProperty("start_c") double startC,
                              @JsonProperty("drift_k_per_min") Double driftKPerMin) {
        public double driftOrZero() { return driftKPerMin == null ? 0 : driftKPerMin; }
    }

    // ---------------------------------------------------------------- helpers for tests and callers

    public AmbientSpec ambientOrDefault() { return ambient == null ? new AmbientSpec(23.0, 0.0) : ambient; }

    public double reflectedCOrDefault() {
        return camera.reflectedC() != null ? camera.reflectedC() : ambientOrDefault().startC();
    }

    /** True when the part with this designator goes into board.json. */
    public boolean isMarked(String ref) {
        return marked == null || marked.contains(ref);
    }

    public Scenario withSeed(long newSeed) {
        return new Scenario(name, newSeed, board, fault, injection, camera, frames, ambient, marked);
    }

    public Scenario withPower(double powerW) {
        return new Scenario(name, seed, board, new Fault(fault.sources(), powerW, fault.waveform(), fault.periodS(),
                fault.duty()), injection, camera, frames, ambient, marked);
    }

    public Scenario withSources(List<SourceShare> sources) {
        return new Scenario(name, seed, board, new Fault(sources, fault.powerW(), fault.waveform(), fault.periodS(),
                fault.duty()), injection, camera, frames, ambient, marked);
    }

    /** Square-wave excitation for lock-in: on for duty * period, off for the rest, from the injection start. */
    public Scenario withSquareWave(double periodS, double duty) {
        return new Scenario(name, seed, board, new Fault(fault.sources(), fault.powerW(), "square", periodS, duty),
                injection, camera, frames, ambient, marked);
    }

    public Scenario withMotion(Motion motion) {
        CameraSpec c = camera;
        return withCamera(c.with(c.width(), c.height(), c.focalPx(), motion, c.netdK(), c.encoding(), c.fixedPatternK(), c.blurSigmaPx()));
    }

    /** Another image size, with the focal length scaled so the board covers the same fraction of the frame. */
    public Scenario withSize(int width, int height) {
        CameraSpec c = camera;
        double f = c.focalPx() * width / (double) c.width();
        return withCamera(new CameraSpec(width, height, f, c.distanceMm(), c.tiltDeg(), c.tiltAxisDeg(), c.rotationDeg(),
                c.offsetPx() == null ? null : new double[]{c.offsetPx()[0] * width / c.width(), c.offsetPx()[1] * width / c.width()},
                c.motion(), c.blurSigmaPx(), c.netdK(), c.fixedPatternK(), c.bandUm(), c.encoding(), c.spanC(),
                c.autoSpan(), c.supersample(), c.backgroundEmissivity(), c.reflectedC(), c.exifStart()));
    }

    public Scenario withNetd(double netdK) {
        CameraSpec c = camera;
        return withCamera(c.with(c.width(), c.height(), c.focalPx(), c.motion(), netdK, c.encoding(), c.fixedPatternK(), c.blurSigmaPx()));
    }

    public Scenario withFixedPattern(double fixedPatternK) {
        CameraSpec c = camera;
        return withCamera(c.with(c.width(), c.height(), c.focalPx(), c.motion(), c.netdK(), c.encoding(), fixedPatternK, c.blurSigmaPx()));
    }

    /** The reflected apparent temperature; null: ambient at the start (a board at ambient then shows no texture). */
    public Scenario withReflectedC(Double reflectedC) {
        CameraSpec c = camera;
        return withCamera(new CameraSpec(c.width(), c.height(), c.focalPx(), c.distanceMm(), c.tiltDeg(), c.tiltAxisDeg(),
                c.rotationDeg(), c.offsetPx(), c.motion(), c.blurSigmaPx(), c.netdK(), c.fixedPatternK(), c.bandUm(),
                c.encoding(), c.spanC(), c.autoSpan(), c.supersample(), c.backgroundEmissivity(), reflectedC,
                c.exifStart()));
    }

    public Scenario withBlur(double sigmaPx) {
        CameraSpec c = camera;
        return withCamera(c.with(c.width(), c.height(), c.focalPx(), c.motion(), c.netdK(), c.encoding(), c.fixedPatternK(), sigmaPx));
    }

    public Scenario withEncoding(FrameEncoding encoding) {
        CameraSpec c = camera;
        return withCamera(c.with(c.width(), c.height(), c.focalPx(), c.motion(), c.netdK(), encoding.id(), c.fixedPatternK(), c.blurSigmaPx()));
    }

    public Scenario withCamera(CameraSpec newCamera) {
        return new Scenario(name, seed, board, fault, injection, newCamera, frames, ambient, marked);
    }

    public Scenario withBoard(BoardSpec newBoard) {
        return new Scenario(name, seed, newBoard, fault, injection, camera, frames, ambient, marked);
    }

    public Scenario withFrames(int count, double intervalS, double injectionStartS) {
        return new Scenario(name, seed, board, fault, injection, camera,
                new Timing(count, intervalS, injectionStartS, frames.timeStepS()), ambient, marked);
    }

    public Scenario withAmbient(double startC, double driftKPerMin) {
        return new Scenario(name, seed, board, fault, injection, camera, frames, new AmbientSpec(startC, driftKPerMin), marked);
    }

    public Scenario withMarked(List<String> refs) {
        return new Scenario(name, seed, board, fault, injection, camera, frames, ambient, refs);
    }

    // ---------------------------------------------------------------- reading

    /** Reads and validates a scenario file. */
    public static Scenario read(Path file) {
        if (!Files.exists(file)) throw new InputRejected(file, "scenario file not found");
        try {
            return parse(org.risetrace.frame.InputFiles.readDocument(file, "scenario file"), file);
        } catch (IOException e) {
            throw new InputRejected(file, "cannot read scenario: " + e.getMessage());
        }
    }

    static Scenario parse(byte[] bytes, Path file) throws IOException {
        Scenario s;
        try {
            s = JSON.readValue(bytes, Scenario.class);
        } catch (UnrecognizedPropertyException e) {
            // records are built after their properties are buffered, so the parser's location is the object's end;
            // find the field's own line and column in the text instead
            String text = new String(bytes, java.nio.charset.StandardCharsets.UTF_8);
            java.util.regex.Matcher m = java.util.regex.Pattern
                    .compile("\"" + java.util.regex.Pattern.quote(e.getPropertyName()) + "\"\\s*:").matcher(text);
            int line = e.getLocation().getLineNr(), col = e.getLocation().getColumnNr();
            if (m.find()) {
                String before = text.substring(0, m.start());
                line = (int) before.chars().filter(ch -> ch == '\n').count() + 1;
                col = m.start() - before.lastIndexOf('\n');
            }
            throw new InputRejected(file, "unknown field '" + pathOf(e) + "' at line " + line + ", column " + col,
                    "the README lists the scenario fields");
        } catch (JsonMappingException e) {
            String where = e.getLocation() == null ? "" : " at line " + e.getLocation().getLineNr() + ", column "
                    + e.getLocation().getColumnNr();
            throw new InputRejected(file, "bad value for field '" + pathOf(e) + "'" + where + ": " + e.getOriginalMessage());
        } catch (JsonProcessingException e) {
            throw new InputRejected(file, "malformed JSON at line " + e.getLocation().getLineNr() + ", column "
                    + e.getLocation().getColumnNr() + ": " + e.getOriginalMessage());
        }
        if (s == null) throw new InputRejected(file, "empty scenario file");
        s.validate(file);
        return s;
    }

    private static String pathOf(JsonMappingException e) {
        StringBuilder sb = new StringBuilder();
        for (JsonMappingException.Reference r : e.getPath()) {
            if (r.getFieldName() != null) {
                if (sb.length() > 0) sb.append('.');
                sb.append(r.getFieldName());
            } else if (r.getIndex() >= 0) sb.append('[').append(r.getIndex()).append(']');
        }
        return sb.toString();
    }

    private static void require(boolean ok, Path file, String field, String message) {
        if (!ok) throw new InputRejected(file, "field '" + field + "' " + message);
    }

    /** Range checks; throws {@link InputRejected} naming the field. */
    public void validate(Path file) {
        require(board != null, file, "board", "is missing");
        require(board.sizeMm() != null && board.sizeMm().length == 2 && board.sizeMm()[0] > 0 && board.sizeMm()[1] > 0,
                file, "board.size_mm", "must be [width, height] with positive millimetres");
        require(board.thicknessOrDefault() > 0, file, "board.thickness_mm", "must be positive");
        double cell = board.cellOrDefault();
        require(cell > 0 && board.widthMm() / cell <= 2000 && board.heightMm() / cell <= 2000, file, "board.cell_mm",
                "must be positive and give at most 2000 cells per side");
        require(board.hConvOrDefault() > 0 && board.hConvOrDefault() < 1000, file, "board.h_conv_w_per_m2k",
                "must be in (0, 1000) W/m^2K");
        for (CopperLayer l : board.copperOrDefault())
            require(l.thicknessUm() > 0 && l.fill() >= 0 && l.fill() <= 1, file, "board.copper_layers",
                    "need thickness_um > 0 and fill in [0, 1]");
        requireEmissivity(board.maskEmissivityOrDefault(), file, "board.mask_emissivity");
        requireEmissivity(board.silkEmissivityOrDefault(), file, "board.silk_emissivity");
        require(List.of("ambient", "idle-steady").contains(board.initialOrDefault()), file, "board.initial",
                "must be \"ambient\" or \"idle-steady\"");
        Set<String> refs = new HashSet<>();
        List<PartSpec> parts = board.partsOrEmpty();
        for (int i = 0; i < parts.size(); i++) {
            PartSpec p = parts.get(i);
            String f = "board.parts[" + i + "]";
            require(p.ref() != null && !p.ref().isBlank(), file, f + ".ref", "is missing");
            require(refs.add(p.ref()), file, f + ".ref", "repeats designator " + p.ref());
            require(p.wMm() > 0 && p.hMm() > 0, file, f + ".w_mm/h_mm", "must be positive");
            require(p.xMm() >= 0 && p.xMm() <= board.widthMm() && p.yMm() >= 0 && p.yMm() <= board.heightMm(), file,
                    f + ".x_mm/y_mm", "puts " + p.ref() + " outside the board");
            require(p.heatCapacityOrDefault() > 0, file, f + ".heat_capacity_j_per_k", "must be positive");
            require(p.contactOrDefault() > 0, file, f + ".contact_w_per_k", "must be positive");
            requireEmissivity(p.emissivityOrDefault(), file, f + ".emissivity");
            requireEmissivity(p.leadEmissivityOrDefault(), file, f + ".lead_emissivity");
            require(List.of("none", "ends", "sides").contains(p.leadsOrDefault()), file, f + ".leads",
                    "must be none, ends or sides");
            require(p.idlePowerOrZero() >= 0, file, f + ".idle_power_w", "must not be negative");
        }
        List<TraceSpec> traces = board.tracesOrEmpty();
        for (int i = 0; i < traces.size(); i++) {
            TraceSpec t = traces.get(i);
            String f = "board.traces[" + i + "]";
            require(t.pointsMm() != null && t.pointsMm().length >= 2, file, f + ".points_mm", "needs two or more [x, y]");
            for (double[] pt : t.pointsMm()) require(pt.length == 2, file, f + ".points_mm", "entries must be [x, y]");
            require(t.widthMm() > 0, file, f + ".width_mm", "must be positive");
            if (t.ref() != null) require(refs.add(t.ref()), file, f + ".ref", "repeats name " + t.ref());
        }
        for (int i = 0; i < board.holesOrEmpty().size(); i++)
            require(board.holesOrEmpty().get(i).diameterMm() > 0, file, "board.holes[" + i + "].diameter_mm", "must be positive");
        require(fault != null, file, "fault", "is missing");
        require(fault.powerW() >= 0, file, "fault.power_w", "must not be negative");
        double shareSum = 0;
        List<SourceShare> srcs = fault.sourcesOrEmpty();
        for (int i = 0; i < srcs.size(); i++) {
            SourceShare s = srcs.get(i);
            require(s.ref() != null && refs.contains(s.ref()), file, "fault.sources[" + i + "].ref",
                    "names no part or trace of the board: " + s.ref());
            require(s.share() >= 0, file, "fault.sources[" + i + "].share", "must not be negative");
            shareSum += s.share();
        }
        require(srcs.isEmpty() || Math.abs(shareSum - 1.0) < 1e-6, file, "fault.sources", "shares must sum to 1, not " + shareSum);
        require(List.of("step", "square").contains(fault.waveformOrDefault()), file, "fault.waveform", "must be step or square");
        if ("square".equals(fault.waveformOrDefault())) {
            require(fault.periodS() != null && fault.periodS() > 0, file, "fault.period_s", "must be positive for a square wave");
            require(fault.dutyOrDefault() > 0 && fault.dutyOrDefault() <= 1, file, "fault.duty", "must be in (0, 1]");
        }
        require(camera != null, file, "camera", "is missing");
        require(camera.width() >= 8 && camera.height() >= 8 && camera.width() <= 8192 && camera.height() <= 8192, file,
                "camera.width/height", "must be 8..8192 pixels");
        require(camera.focalPx() > 0, file, "camera.focal_px", "must be positive");
        require(camera.distanceMm() > 0, file, "camera.distance_mm", "must be positive");
        require(Math.abs(camera.tiltOrZero()) < 60, file, "camera.tilt_deg", "must be within +-60 degrees");
        require(camera.encodingOrDefault() != null, file, "camera.encoding", "must be one of " + FrameEncoding.knownIds());
        if (camera.encodingOrDefault() == FrameEncoding.U8_SPAN_PNG && !camera.autoSpanOrFalse())
            require(camera.spanC() != null && camera.spanC().length == 2 && camera.spanC()[1] > camera.spanC()[0], file,
                    "camera.span_c", "must be [low, high] for u8-span-png without auto_span");
        require(camera.blurOrDefault() >= 0 && camera.blurOrDefault() <= 10, file, "camera.blur_sigma_px", "must be 0..10");
        require(camera.netdOrDefault() >= 0, file, "camera.netd_k", "must not be negative");
        require(camera.fixedPatternOrDefault() >= 0, file, "camera.fixed_pattern_k", "must not be negative");
        require(camera.supersampleOrDefault() >= 1 && camera.supersampleOrDefault() <= 8, file, "camera.supersample", "must be 1..8");
        requireEmissivity(camera.backgroundEmissivityOrDefault(), file, "camera.background_emissivity");
        double[] band = camera.bandOrDefault();
        require(band.length == 2 && band[1] > band[0] && band[0] > 0, file, "camera.band_um", "must be [from, to] with to > from > 0");
        Motion m = camera.motionOrDefault();
        require(List.of("stand", "handheld").contains(m.kind() == null ? "" : m.kind()), file, "camera.motion.kind",
                "must be stand or handheld");
        require(m.driftOrDefault() >= 0 && m.rotationOrDefault() >= 0 && m.rotationOrDefault() <= 45
                && m.scaleOrDefault() >= 0 && m.scaleOrDefault() < 0.5 && m.translationOrDefault() >= 0
                && m.translationOrDefault() <= 0.5, file, "camera.motion", "amplitudes out of range");
        if (camera.exifStart() != null) {
            try {
                java.time.Instant.parse(camera.exifStart());
            } catch (java.time.format.DateTimeParseException e) {
                throw new InputRejected(file, "field 'camera.exif_start' must be an ISO-8601 instant like 2026-11-30T10:00:00Z");
            }
        }
        require(frames != null, file, "frames", "is missing");
        require(frames.count() >= 1 && frames.count() <= 100000, file, "frames.count", "must be 1..100000");
        require(frames.intervalS() > 0, file, "frames.interval_s", "must be positive");
        require(frames.injectionStartS() >= 0, file, "frames.injection_start_s", "must not be negative");
        require(frames.timeStepOrDefault() > 0, file, "frames.time_step_s", "must be positive");
        if (marked != null) {
            List<String> bad = new ArrayList<>();
            for (String r : marked) if (parts.stream().noneMatch(p -> p.ref().equals(r))) bad.add(r);
            require(bad.isEmpty(), file, "marked", "names parts not on the board: " + bad);
        }
    }

    private static void requireEmissivity(double e, Path file, String field) {
        require(e > 0 && e <= 1, file, field, "must be in (0, 1]");
    }
}
