package org.risetrace.registration;

import org.risetrace.board.Board;
import org.risetrace.frame.Frame;
import org.risetrace.numeric.OrderStatistics;

import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * Registration of frames to the prepared reference: start estimates from (1) this thread's last good mapping or
 * the identity, (2) a coarse search on the top pyramid level, (3) BoofCV features with RANSAC, each refined by
 * {@link DirectAligner} and graded by {@link #evaluate}; the first ok result wins, else the best one. Thread-safe:
 * the reference model is immutable and every thread keeps its own pyramid, aligner, matcher and last estimate.
 */
final class DirectRegistrar implements Registrar {
    private final ReferenceModel ref;
    private final RegistrationConfig config;
    /**
     * The calling thread's workspace. A chain link is made and used by one thread only and has one workspace of its
     * own: with a thread-local one, each replaced link left its workspace (its buffers, the frame it last graded ok)
     * in the thread's map until the map happened to clear the stale entry, so the heap grew with the links made.
     */
    private final java.util.function.Supplier<Workspace> workspace;

    private static final class Workspace {
        Pyramid pyramid = new Pyramid();
        /** Where this thread's chain links are prepared (reused link after link; no link keeps it). */
        Pyramid linkScratch;
        /** The grading's samples at the score pixels and their differences (reused frame after frame). */
        float[] scoreValues = new float[0], scoreDiff = new float[0];
        /** The frame's top level before clipping (each reference clips it to its own range). */
        float[] topUnclipped;
        final DirectAligner aligner = new DirectAligner();
        FeatureSet.Matcher matcher;
        Homography previous;
        /** The last frame graded ok on this thread and its reference-to-frame mapping (for chaining). */
        Frame lastGood;
        Homography lastGoodRefToFrame;
        DirectRegistrar chain;
        String chainName;
        /** The last frame on this thread was registered through the chain link. */
        boolean lastChained;
        /** Frames graded ok through the current link (it is renewed after MAX_LINK_USES). */
        int linkUses;
        /** Uncertainty of lastGood's mapping, and of the current link's earlier frame. */
        MappingUncertainty lastGoodUncertainty = MappingUncertainty.NONE, chainBaseUncertainty = MappingUncertainty.NONE;
        /** Uncertainty of the last result on this thread (diagnostics and calibration). */
        MappingUncertainty lastUncertainty = MappingUncertainty.NONE;
        /**
         * This frame's homography refinements ({@link #attempt}): the similarity each started from and its grade
         * (null when the alignment lost the frame). Cleared for every frame.
         */
        final List<Homography> refinedFrom = new java.util.ArrayList<>();
        final List<Grade> refined = new java.util.ArrayList<>();
        /** Homography refinements made and reused on this thread (tests). */
        long refinementsMade, refinementsReused;
        /** Whether homographies have been paying off on this thread; chain links share their registrar's. */
        HomographyRecord homographies = new HomographyRecord();
    }

    /**
     * How the last homography refinements on a thread fared, and what follows from it. A refinement costs more than
     * the similarity it starts from (eight parameters, two levels) and is kept only when it grades better.
     *
     * <p>Where the perspective between reference and frame stays the same (a stand, or a camera that moves within
     * its own image plane: shifted, turned about its axis, brought closer) it almost never is: after {@link
     * #IDLE_AFTER} refinements in a row that were not kept, only every {@link #PROBE_EVERY}-th similarity that would
     * be refined is, and one kept refinement restores every one ({@link #refine}).
     *
     * <p>Where the camera tilts afresh in every frame (held in the hand) it almost always is: after {@link
     * #KEPT_BEFORE_STRAIGHT} kept in a row, a start is aligned as a similarity on the coarse levels only and refined
     * as a homography from level 1 down, graded once ({@link #straightToHomography}): the similarity's own
     * full-resolution alignment and grade were made only to be replaced, and a similarity that grades ok with its
     * check patches within {@link #TRY_HOMOGRAPHY_RMS_PX} is not refined at all, although it can be off by more
     * than a pixel at the corners when the picture tilts. A straight start that grades ok leaves the record as it
     * is (no similarity to compare with): the run continues until a fallback's refinement is not kept.
     *
     * <p>Measured (one thread, registration alone, DEVELOPERS.md "Sixth pass"): the simulator's 300-frame hand-held
     * series kept 1 of 38 refinements made and skipped 230, 13-20 % less time, every status and corner unchanged;
     * the second generator's hand-held series (tilted afresh in every frame) kept every refinement, skipped none,
     * and went straight to the homography in 36 of 39 and 115 of 119 frames: 14-47 % less time, statuses unchanged,
     * the largest ok frame's corner error 0.03-0.16 px where it had been 0.36-2.8 px on four of eight series.
     */
    static final class HomographyRecord {
        /** Refinements not kept / kept in a row; skipped since the last probe. */
        int notKept, keptRun, skipped;
        long kept, notKeptTotal, probes, skips, straight, straightWeak;

        boolean refine() {
            if (notKept < IDLE_AFTER) return true;
            if (++skipped >= PROBE_EVERY) { skipped = 0; probes++; return true; }
            skips++;
            return false;
        }

        boolean straightToHomography() {
            return keptRun >= KEPT_BEFORE_STRAIGHT;
        }

        void outcome(boolean kept) {
            if (kept) { notKept = 0; skipped = 0; keptRun++; this.kept++; } else { notKept++; keptRun = 0; notKeptTotal++; }
        }
    }

    static final int IDLE_AFTER = 3;
    static final int PROBE_EVERY = 8;
    static final int KEPT_BEFORE_STRAIGHT = 3;

    /** Whether a frame's refinements from the same start are reused (chain links take it over); false only in tests. */
    boolean reuseRefinements = true;
    /** Whether homography refinements that have not been paying off are made only now and then (false: tests). */
    boolean skipIdleHomographies = true;
    /** Whether starts go straight to the homography where homographies have been kept (false: tests). */
    boolean straightToHomography = true;

    /** {made, reused} homography refinements on the calling thread, this registrar's own (tests). */
    long[] refinementCounts() {
        Workspace ws = workspace.get();
        return new long[]{ws.refinementsMade, ws.refinementsReused};
    }

    /**
     * Homographies on the calling thread, links included (tests): {refinements kept, not kept, skipped, probes,
     * straight ones ok or failed, straight ones weak or lost}.
     */
    long[] homographyCounts() {
        HomographyRecord h = workspace.get().homographies;
        return new long[]{h.kept, h.notKeptTotal, h.skips, h.probes, h.straight, h.straightWeak};
    }

    /** The grade of a board-to-frame mapping against this registrar's own reference (diagnostics). */
    Grade gradeAgainstReference(Frame frame, Homography boardToFrame) {
        Pyramid p = new Pyramid();
        p.build(frame.celsius(), frame.width(), frame.height(), ref.levels);
        return evaluate(p, boardToFrame.compose(ref.boardToReference.inverse()).normalized(), true);
    }

    /** The uncertainty parts of the last frame registered on the calling thread (calibration, tests). */
    MappingUncertainty lastUncertainty() {
        return workspace.get().lastUncertainty;
    }

    /** Whether frames that no longer match the reference may be registered through the last ok frame. */
    private final boolean mayChain;

    /** Quality of one candidate mapping (reference to frame). */
    record Grade(Homography refToFrame, RegistrationStatus status, String reason, double similarity, double rmsPx,
                 int inliers, MappingUncertainty uncertainty) {
        Grade(Homography refToFrame, RegistrationStatus status, String reason, double similarity, double rmsPx,
              int inliers) {
            this(refToFrame, status, reason, similarity, rmsPx, inliers, MappingUncertainty.NONE);
        }

        int rank() { return status == RegistrationStatus.OK ? 2 : status == RegistrationStatus.WEAK ? 1 : 0; }

        boolean betterThan(Grade o) {
            return o == null || rank() > o.rank() || (rank() == o.rank() && similarity > o.similarity);
        }
    }

    /**
     * An ok mapping needs at least this many agreeing check patches: four patches over-determine the similarity
     * whose correction enters the corner error estimate (8 shifts, 4 parameters). The grade itself follows the
     * estimated corner error: a board at ambient has little texture, and a count of textured patches says how much
     * texture there is, not how good the mapping is.
     */
    static final int MIN_AGREEING_PATCHES_OK = 4;
    /** Estimated corner error (px, {@link MappingUncertainty#cornerSigmaPx()}) up to which a mapping is ok. */
    static final double OK_SIGMA_PX = 0.35;
    /** Estimated corner error beyond which the mapping is refused (failed). */
    static final double FAIL_SIGMA_PX = 1.5;
    /** Coarse-search candidates refined (more changed nothing on simulated series). */
    static final int CANDIDATES = 2;

    DirectRegistrar(ReferenceModel ref, RegistrationConfig config) {
        this(ref, config, true);
    }

    private DirectRegistrar(ReferenceModel ref, RegistrationConfig config, boolean mayChain) {
        this.mayChain = mayChain;
        this.ref = ref;
        this.config = config;
        if (mayChain) {
            ThreadLocal<Workspace> perThread = ThreadLocal.withInitial(Workspace::new);
            this.workspace = perThread::get;
        } else {
            Workspace own = new Workspace();
            this.workspace = () -> own;
        }
    }

    @Override
    public FrameRegistration register(Frame frame) {
        return register(frame, null);
    }

    /**
     * @param shared the calling registrar's workspace when this is its chain link (same thread, same frame):
     *               the frame's pyramid is taken from it instead of built again
     */
    private FrameRegistration register(Frame frame, Workspace shared) {
        String name = frame.fileName();
        try {
            Board board = ref.board;
            Map<String, double[][]> marked = board.outline().frames();
            if (marked != null && marked.containsKey(name))
                return markedResult(frame, marked.get(name), "corners marked in the board file");
            if (name.equals(ref.referenceName))
                return markedResult(frame, board.outline().cornersPx(), "reference frame");
            if (frame.width() != ref.width || frame.height() != ref.height)
                return failed(frame, "frame is " + frame.width() + "x" + frame.height() + ", the reference frame "
                        + ref.width + "x" + ref.height);
            Workspace ws = workspace.get();
            ws.refinedFrom.clear();
            ws.refined.clear();
            if (shared == null) {
                if (!ws.pyramid.build(frame.celsius(), frame.width(), frame.height(), ref.levels))
                    return failed(frame, "frame holds no readings");
                // on level 1 (made over the whole frame; level 0 waits for a mapping), against the reference's own
                double texture = Pyramid.spread(ws.pyramid.bandPass[Math.min(1, ref.levels - 1)]);
                if (texture < 0.05 * ref.levelOneSpread)
                    return failed(frame, "frame is uniform: no texture to register");
                int top = ref.levels - 1;
                ws.topUnclipped = java.util.Arrays.copyOf(ws.pyramid.bandPass[top], ws.pyramid.bandPass[top].length);
            } else { // a chain link: the frame's pyramid as its main registrar built it
                ws.pyramid = shared.pyramid;
                ws.topUnclipped = shared.topUnclipped;
            }
            clipTop(ws);
            // once heating has moved the picture away from the reference, the link that served the last frame is
            // tried first: on a heated series the direct starts then only cost time (a chain link's frame graded ok
            // is kept as long as it keeps grading ok, instead of preparing a new reference per frame)
            boolean chainTried = false;
            if (mayChain && linkReusable(ws)) {
                chainTried = true;
                FrameRegistration c = viaChain(ws, frame);
                if (c.status() == RegistrationStatus.OK) return rememberChained(ws, frame, c);
                ws.lastChained = false;
                clipTop(ws); // the link clipped the shared top level to its own reference's range
            }
            Grade best = null;
            int top = ref.levels - 1;
            boolean auto = config.method().equals("auto"), search = !config.method().equals("features");
            // which start first: the last estimate, unless it scores poorly on the top level and the coarse search
            // finds the board elsewhere (a new hand-held pose: refining the old one there wasted a full-resolution
            // alignment per frame). The same starts are tried either way, only the order differs.
            List<CoarseSearch.Candidate> cands = null;
            boolean previousFirst = auto;
            if (auto && ws.previous != null && search
                    && CoarseSearch.score(ref, ws.pyramid, ws.previous) < PREVIOUS_TRUSTED_SCORE) {
                cands = CoarseSearch.search(ref, ws.pyramid, CANDIDATES);
                previousFirst = cands.isEmpty() || agree(cands.get(0).refToFrame(), ws.previous, top);
            }
            if (previousFirst) {
                best = fromPrevious(ws, best);
                if (best != null && best.rank() == 2) return finish(frame, ws, best);
            }
            if (search) {
                if (cands == null) cands = CoarseSearch.search(ref, ws.pyramid, CANDIDATES);
                ws.aligner.robustFromStart = true;
                for (CoarseSearch.Candidate c : cands) {
                    // refined from one level below the search's: its candidates are within a top-level pixel,
                    // and on the top level itself a heated part's blob pulled the fit away again (on simulated
                    // hand-held series this cut failed frames from 12 to 2 of 140)
                    best = attempt(ws, c.refToFrame(), Math.max(0, top - 1), best);
                    if (best != null && best.rank() == 2) { ws.aligner.robustFromStart = false; return finish(frame, ws, best); }
                }
                ws.aligner.robustFromStart = false;
            }
            if (auto && !previousFirst) {
                best = fromPrevious(ws, best);
                if (best != null && best.rank() == 2) return finish(frame, ws, best);
            }
            int fast = Math.min(2, top);
            // features only when no start came close: when one graded weak the frame is where it was looked for
            // and has changed (heating), which a feature start does not mend (it converged to the same mapping)
            if (best == null || best.rank() == 0) {
                FeatureSet features = ref.features();
                if (features != null) {
                    if (ws.matcher == null) ws.matcher = new FeatureSet.Matcher(2.0);
                    int[] inl = new int[1];
                    ws.pyramid.ensureLevel0All();
                    Homography f = ws.matcher.match(features, ws.pyramid.bandPass[0], ref.width, ref.height, inl);
                    if (f != null && plausibility(f) == null) best = attempt(ws, f, fast, best);
                }
            }
            if (mayChain && (best == null || best.rank() < 2) && ws.lastGood != null) {
                FrameRegistration chained = throughLastGood(ws, frame, chainTried);
                if (chained != null && chained.status() == RegistrationStatus.OK) return rememberChained(ws, frame, chained);
                if (chained != null && chained.status() == RegistrationStatus.WEAK && (best == null || best.rank() == 0))
                    return chained;
            }
            if (best == null) return failed(frame, "no mapping found: nothing in the frame matches the reference");
            return finish(frame, ws, best);
        } catch (RuntimeException e) {
            return failed(frame, "registration error: " + e);
        }
    }

    /**
     * The start from this thread's last estimate (identity at first): a similarity refined at full resolution only
     * (a stand drifts by a fraction of a pixel, and on the coarse levels a heated part's broad blob outweighs the
     * board's fine texture and can pull the fit away); from the coarser level only when that came close (weak) or
     * there is no last estimate: a start that failed outright is a new pose, which the coarse search finds for less.
     */
    private Grade fromPrevious(Workspace ws, Grade best) {
        Homography start = ws.previous != null ? ws.previous : Homography.identity();
        ws.aligner.robustFromStart = true;
        try {
            if (ws.previous != null) {
                // the camera moved by whole pixels since (hand-held): start from the moved estimate one level up,
                // within reach of the alignment; on a stand the shift is zero and this costs one small search
                double[] moved = CoarseSearch.localShift(ref, ws.pyramid, start);
                if (moved != null) {
                    Homography shifted = new Homography(new double[]{1, 0, moved[0], 0, 1, moved[1], 0, 0, 1})
                            .compose(start).normalized();
                    best = attempt(ws, shifted, Math.min(1, ref.levels - 1), best);
                    if (best != null && best.rank() == 2) return best;
                }
                Grade g = alignAndGrade(ws, start, 0, 4);
                if (g != null && g.betterThan(best)) best = g;
                if (best != null && best.rank() == 2) return best;
            }
            if (ws.previous == null || best == null || best.rank() == 1)
                best = attempt(ws, start, Math.min(2, ref.levels - 1), best);
            return best;
        } finally {
            ws.aligner.robustFromStart = false;
        }
    }

    /**
     * Top-level correlation above which the last estimate is refined first without a coarse search (a stand's
     * frames score 0.8-0.95 at their last estimate; a frame of a new hand-held pose scores under 0.3 there).
     */
    static final double PREVIOUS_TRUSTED_SCORE = 0.5;

    /** True when two mappings put the reference's board corners within 1.5 top-level pixels of each other. */
    private boolean agree(Homography a, Homography b, int top) {
        return cornersWithin(a, b, 1.5 * Pyramid.scale(top));
    }

    /**
     * Aligns from start with the simplest motion that explains the frame: first a similarity (shift, rotation,
     * zoom: 4 parameters, what a stand's drift and most hand-held motion are, and far better conditioned on weakly
     * textured thermal images than 8), then, when that does not grade ok, the full homography refined from it; the
     * homography is kept only when it grades better or its check patches agree clearly more closely.
     */
    /**
     * An ok similarity whose check patches still disagree by more than this (px RMS) is refined as a homography
     * too: a hand-held camera tilts, and a similarity cannot follow the perspective (on the second synthetic
     * generator's hand-held series ok similarities were up to 1.6 px off at the corners while their patches agreed
     * within 0.3 px; with the homography tried the largest error fell to 0.76 px, mean 0.16 -> 0.03 px).
     */
    static final double TRY_HOMOGRAPHY_RMS_PX = 0.2;

    private Grade attempt(Workspace ws, Homography start, int fromLevel, Grade best) {
        if (fromLevel >= 1 && straightToHomography && ws.homographies.straightToHomography()) {
            ws.aligner.model = 4;
            Homography coarse = fromLevel >= 2 ? ws.aligner.align(ref, ws.pyramid, start, fromLevel, 2) : start;
            Grade h = coarse == null ? null : alignAndGrade(ws, coarse, 1, 8);
            // ok, or failed outright (the start was in the wrong basin: on the second generator's series the
            // similarity first failed in every such case too); weak or lost goes the similarity's way below
            if (h != null && h.rank() != 1) {
                ws.homographies.straight++;
                return h.betterThan(best) ? h : best;
            }
            ws.homographies.straightWeak++;
        }
        Grade simple = alignAndGrade(ws, start, fromLevel, 4);
        if (simple != null && simple.rank() == 2 && !(simple.rmsPx() > TRY_HOMOGRAPHY_RMS_PX))
            return simple.betterThan(best) ? simple : best;
        // a similarity that failed outright was in the wrong basin: 4 more parameters will not bring it back
        // (on simulated hand-held series skipping them moved one frame of 140 from ok to failed and cut the
        // 640 x 512 benchmark by a tenth)
        if (simple != null && simple.rank() == 0) return simple.betterThan(best) ? simple : best;
        // where homographies have not been kept lately, the similarity stands (perspective that does not change
        // between frames is in the reference already); every PROBE_EVERY-th is still refined to notice a change
        if (simple != null && skipIdleHomographies && !ws.homographies.refine())
            return simple.betterThan(best) ? simple : best;
        Grade full = simple != null ? refinedAsHomography(ws, simple.refToFrame())
                : alignAndGrade(ws, start, fromLevel, 8);
        Grade pick;
        if (simple == null) pick = full;
        else if (full == null) pick = simple;
        else if (full.rank() != simple.rank()) pick = full.rank() > simple.rank() ? full : simple;
        else pick = full.rmsPx() < 0.7 * simple.rmsPx() ? full : simple;
        if (simple != null && full != null) ws.homographies.outcome(pick == full);
        if (pick == null) return best;
        return pick.betterThan(best) ? pick : best;
    }

    /**
     * Starts closer than this (px, at every reference board corner) refine to the same homography: a frame that
     * grades no better than weak (heating changed the picture) is tried from the last estimate and from each
     * coarse-search candidate, and those starts mostly settle on the same similarity (on a simulated 300-frame
     * hand-held series, up to four times in one frame), each then refined as a homography once more. A refinement
     * moves a mapping by steps down to the alignment's own tolerance of 0.02 px, so 0.01 px apart is the same start.
     */
    static final double SAME_START_PX = 0.01;

    /** The homography refined from a similarity (level 1 down), or this frame's earlier one from the same start. */
    private Grade refinedAsHomography(Workspace ws, Homography similarity) {
        for (int i = 0; reuseRefinements && i < ws.refinedFrom.size(); i++)
            if (cornersWithin(ws.refinedFrom.get(i), similarity, SAME_START_PX)) {
                ws.refinementsReused++;
                return ws.refined.get(i);
            }
        Grade full = alignAndGrade(ws, similarity, Math.min(1, ref.levels - 1), 8);
        ws.refinementsMade++;
        ws.refinedFrom.add(similarity);
        ws.refined.add(full);
        return full;
    }

    /** True when the two mappings put every reference board corner within limit px of each other. */
    private boolean cornersWithin(Homography a, Homography b, double limit) {
        for (double[] c : ref.referenceCornersPx) {
            double[] p = a.apply(c[0], c[1]), q = b.apply(c[0], c[1]);
            if (!(Math.hypot(p[0] - q[0], p[1] - q[1]) <= limit)) return false;
        }
        return true;
    }

    private Grade alignAndGrade(Workspace ws, Homography start, int fromLevel, int model) {
        ws.aligner.model = model;
        Homography h = ws.aligner.align(ref, ws.pyramid, start, fromLevel);
        if (h == null) return null;
        return evaluate(ws.pyramid, h, ws.aligner.converged, ws.aligner.cornerVariance(ref, ws.pyramid, h, model));
    }

    /**
     * Parts that heat change the picture until the reference no longer matches (texture from emissivity contrast
     * fades and inverts as a surface passes the reflected temperature). Such a frame is registered to a frame
     * graded ok earlier on this thread, which shares most of the heating, and the two mappings are composed; each
     * link adds its own small error, so a link is only used when the direct mapping did not grade ok, and it is
     * kept while it grades ok (fewer links, less error than re-linking every frame). When the current link does
     * not grade ok (or was tried already), a new one is made from the freshest ok frame.
     */
    private FrameRegistration throughLastGood(Workspace ws, Frame frame, boolean currentTried) {
        FrameRegistration r = null;
        if (!currentTried && linkReusable(ws)) {
            r = viaChain(ws, frame);
            if (r.status() == RegistrationStatus.OK) return r;
        }
        String name = ws.lastGood.fileName();
        if (name.equals(ws.chainName) && r != null) return r;
        Homography boardToLast = ws.lastGoodRefToFrame.compose(ref.boardToReference).normalized();
        double[][] corners = Homographies.boardCorners(ref.board, boardToLast);
        org.risetrace.board.Board b = new org.risetrace.board.Board(ref.board.name(), ref.board.sizeMm(),
                new org.risetrace.board.Outline(name, corners, null), ref.board.parts(), ref.board.ambient());
        try {
            if (ws.linkScratch == null) ws.linkScratch = new Pyramid();
            ws.chain = new DirectRegistrar(ReferenceModel.prepareHeated(ws.lastGood, b, config.withMethod("search"),
                    ws.linkScratch),
                    config.withMethod("auto"), false);
            ws.chain.reuseRefinements = reuseRefinements;
            ws.chain.skipIdleHomographies = skipIdleHomographies;
            ws.chain.straightToHomography = straightToHomography;
            ws.chain.workspace.get().homographies = ws.homographies;
        } catch (RuntimeException e) {
            return r;
        }
        ws.chainName = name;
        ws.chainBaseUncertainty = ws.lastGoodUncertainty;
        ws.linkUses = 0;
        // the new link starts from this thread's last estimate carried over to its reference
        if (ws.previous != null)
            ws.chain.workspace.get().previous = ws.previous.compose(ws.lastGoodRefToFrame.inverse()).normalized();
        FrameRegistration fresh = viaChain(ws, frame);
        return r == null || rank(fresh) >= rank(r) ? fresh : r;
    }

    /**
     * A link is reused only while it served the last frame on this thread and at most MAX_LINK_USES frames: on
     * simulated stand series an older link graded a frame ok that was 0.99 px off, where a link from the freshest
     * ok frame graded it weak at 0.08 px.
     */
    static final int MAX_LINK_USES = 4;

    private static boolean linkReusable(Workspace ws) {
        return ws.chain != null && ws.lastChained && ws.linkUses < MAX_LINK_USES;
    }

    private FrameRegistration viaChain(Workspace ws, Frame frame) {
        return linked(ws, ws.chain.register(frame, ws));
    }

    /**
     * The top level clipped to this reference's range (for the coarse search), from the unclipped copy: the top
     * level only, clipping the lower levels too gave no gain.
     */
    private void clipTop(Workspace ws) {
        int top = ref.levels - 1;
        float[] level = ws.pyramid.bandPass[top];
        System.arraycopy(ws.topUnclipped, 0, level, 0, level.length);
        if (ref.level[top].n >= 16 && top >= 1)
            CoarseSearch.clipInPlace(level, ws.pyramid.widths[top] * ws.pyramid.heights[top], ref.level[top].t);
    }

    private static int rank(FrameRegistration r) {
        return r.status() == RegistrationStatus.OK ? 2 : r.status() == RegistrationStatus.WEAK ? 1 : 0;
    }

    /**
     * A frame graded ok through a chain link is aligned once more directly to the reference, started from the
     * composed mapping, with the pixels where heat changed the picture left out ({@link DirectAligner}): composing
     * link after link lets small errors add up (on simulated 40-frame series with heating, ok frames drifted to
     * 2.3 px after ten links), while the start is close enough for the direct refinement to hold. The link's own
     * checks (against a frame that shares the heating) stay the consistency check; the corner error estimate is the
     * direct alignment's. The composed mapping is kept when the direct one fails.
     */
    private FrameRegistration rememberChained(Workspace ws, Frame frame, FrameRegistration chained) {
        clipTop(ws);
        Homography composed = chained.boardToFrame().compose(ref.boardToReference.inverse()).normalized();
        ws.aligner.robustFromStart = true;
        Grade d = alignAndGrade(ws, composed, 0, 4);
        ws.aligner.robustFromStart = false;
        if (d != null && d.status() != RegistrationStatus.FAILED) {
            Homography b2f = d.refToFrame().compose(ref.boardToReference).normalized();
            ws.lastUncertainty = d.uncertainty();
            chained = new FrameRegistration(chained.file(), chained.tSeconds(), chained.status(), chained.reason(),
                    b2f, Homographies.boardCorners(ref.board, b2f), d.inliers(), d.rmsPx(), d.similarity(),
                    d.uncertainty().cornerSigmaPx());
        }
        double sigma = chained.cornerSigmaPx();
        if (sigma > OK_SIGMA_PX) // the link agreed, but the mapping is not known well enough for ok
            return new FrameRegistration(chained.file(), chained.tSeconds(),
                    sigma > FAIL_SIGMA_PX ? RegistrationStatus.FAILED : RegistrationStatus.WEAK,
                    chained.reason() + String.format(Locale.ROOT, "; estimated corner error %.2f px", sigma),
                    sigma > FAIL_SIGMA_PX ? null : chained.boardToFrame(),
                    sigma > FAIL_SIGMA_PX ? null : chained.boardCornersPx(), chained.inliers(), chained.rmsPx(),
                    chained.similarity(), sigma);
        remember(ws, frame, chained.boardToFrame().compose(ref.boardToReference.inverse()));
        ws.lastGoodUncertainty = ws.lastUncertainty;
        ws.lastChained = true;
        ws.linkUses++;
        return chained;
    }

    /** A link's result with the link named in its reason (the evidence says how each frame was mapped). */
    private static FrameRegistration linked(Workspace ws, FrameRegistration r) {
        String via = "through " + ws.chainName + " (an earlier ok frame: heating changed the picture)";
        MappingUncertainty u = ws.chain.workspace.get().lastUncertainty.after(ws.chainBaseUncertainty);
        ws.lastUncertainty = u;
        double sigma = r.boardToFrame() == null ? Double.NaN : u.cornerSigmaPx();
        RegistrationStatus status = r.status();
        String reason = r.reason() == null ? via : via + "; " + r.reason();
        if (status == RegistrationStatus.OK && sigma > OK_SIGMA_PX) {
            // both mappings' errors add: the link alone may be ok while the composed mapping is not
            status = RegistrationStatus.WEAK;
            reason += String.format(Locale.ROOT, "; estimated corner error %.2f px", sigma);
        }
        return new FrameRegistration(r.file(), r.tSeconds(), status, reason, r.boardToFrame(), r.boardCornersPx(),
                r.inliers(), r.rmsPx(), r.similarity(), sigma);
    }

    private void remember(Workspace ws, Frame frame, Homography refToFrame) {
        ws.previous = refToFrame;
        ws.lastGood = frame;
        ws.lastGoodRefToFrame = refToFrame;
    }

    private FrameRegistration finish(Frame frame, Workspace ws, Grade g) {
        ws.lastUncertainty = g.uncertainty();
        if (g.status() == RegistrationStatus.FAILED)
            return new FrameRegistration(frame.fileName(), frame.tSeconds(), RegistrationStatus.FAILED, g.reason(),
                    null, null, g.inliers(), g.rmsPx(), g.similarity());
        ws.previous = g.refToFrame();
        if (g.status() == RegistrationStatus.OK) {
            remember(ws, frame, g.refToFrame());
            ws.lastGoodUncertainty = g.uncertainty();
            ws.lastChained = false;
        }
        Homography boardToFrame = g.refToFrame().compose(ref.boardToReference).normalized();
        return new FrameRegistration(frame.fileName(), frame.tSeconds(), g.status(), g.reason(), boardToFrame,
                Homographies.boardCorners(ref.board, boardToFrame), g.inliers(), g.rmsPx(), g.similarity(),
                g.uncertainty().cornerSigmaPx());
    }

    private FrameRegistration markedResult(Frame frame, double[][] corners, String why) {
        Homography h = Homographies.boardToFrame(ref.board, corners);
        workspace.get().lastUncertainty = MappingUncertainty.NONE;
        // marked corners are the board's definition: no registration error (the marking's own error is common to
        // every frame and belongs to the outline, not to the mapping)
        return new FrameRegistration(frame.fileName(), frame.tSeconds(), RegistrationStatus.MARKED, why, h,
                Homographies.boardCorners(ref.board, h), 0, Double.NaN, Double.NaN, 0.0);
    }

    private FrameRegistration failed(Frame frame, String reason) {
        workspace.get().lastUncertainty = MappingUncertainty.NONE;
        return new FrameRegistration(frame.fileName(), frame.tSeconds(), RegistrationStatus.FAILED, reason, null, null,
                0, Double.NaN, Double.NaN);
    }

    /** Null when the mapping of the board outline is plausible relative to the reference, else why not. */
    String plausibility(Homography refToFrame) {
        double[][] rc = ref.referenceCornersPx;
        double[][] fc = new double[4][];
        for (int i = 0; i < 4; i++) {
            fc[i] = refToFrame.apply(rc[i][0], rc[i][1]);
            if (!Double.isFinite(fc[i][0]) || !Double.isFinite(fc[i][1])) return "mapping sends a corner to infinity";
            if (fc[i][0] < -0.5 * ref.width || fc[i][0] > 1.5 * ref.width
                    || fc[i][1] < -0.5 * ref.height || fc[i][1] > 1.5 * ref.height)
                return "mapping puts a board corner far outside the frame";
        }
        double areaRef = ReferenceModel.polygonArea(rc), areaNew = ReferenceModel.polygonArea(fc);
        if (!(areaNew > 0)) return "mapping folds the board outline";
        double zoom = Math.sqrt(areaNew / areaRef), maxZoom = config.maxScaleChange();
        if (zoom > maxZoom || zoom < 1 / maxZoom)
            return String.format(Locale.ROOT, "implausible zoom %.2f against the reference", zoom);
        for (int i = 0; i < 4; i++) {
            double lr = dist(rc[i], rc[(i + 1) % 4]), ln = dist(fc[i], fc[(i + 1) % 4]);
            double ratio = ln / lr / zoom;
            if (ratio > 1.3 || ratio < 1 / 1.3) return "implausible perspective: board edge stretched by "
                    + String.format(Locale.ROOT, "%.2f", ratio);
            double ar = angle(rc[(i + 3) % 4], rc[i], rc[(i + 1) % 4]), an = angle(fc[(i + 3) % 4], fc[i], fc[(i + 1) % 4]);
            if (Math.abs(ar - an) > config.maxAngleChangeDeg())
                return String.format(Locale.ROOT, "implausible shear: corner angle changed by %.1f deg", Math.abs(ar - an));
            double cross = (fc[(i + 1) % 4][0] - fc[i][0]) * (fc[(i + 2) % 4][1] - fc[(i + 1) % 4][1])
                    - (fc[(i + 1) % 4][1] - fc[i][1]) * (fc[(i + 2) % 4][0] - fc[(i + 1) % 4][0]);
            if (cross <= 0) return "mapping makes the board outline non-convex";
        }
        return null;
    }

    private static double dist(double[] a, double[] b) { return Math.hypot(a[0] - b[0], a[1] - b[1]); }

    private static double angle(double[] prev, double[] at, double[] next) {
        double a1 = Math.atan2(prev[1] - at[1], prev[0] - at[0]), a2 = Math.atan2(next[1] - at[1], next[0] - at[0]);
        double d = Math.toDegrees(a2 - a1);
        while (d < 0) d += 360;
        while (d >= 360) d -= 360;
        return d;
    }

    /**
     * Grades a mapping: plausibility of the outline, normalised cross-correlation of the band-passed images over
     * the board, and a local check: each textured patch of the reference is re-aligned by translation alone
     * (Lucas and Kanade 1981) in the frame mapped back through the homography; a patch agrees when its residual
     * shift stays under 1 px. rms_px is the RMS residual shift of the agreeing patches, inliers their number.
     */
    Grade evaluate(Pyramid frame, Homography h, boolean converged) {
        return evaluate(frame, h, converged, new DirectAligner().cornerVariance(ref, frame, h, 8));
    }

    /** @param alignVariance the alignment's own corner variance ({@link DirectAligner#cornerVariance}), px^2 */
    Grade evaluate(Pyramid frame, Homography h, boolean converged, double alignVariance) {
        String implausible = plausibility(h);
        if (implausible != null) return new Grade(h, RegistrationStatus.FAILED, implausible, Double.NaN, Double.NaN, 0);
        double[] m = h.values();
        frame.ensureLevel0(ref, m);
        float[] img = frame.bandPass[0];
        int w = frame.widths[0], hh = frame.heights[0];
        int n = ref.scoreX.length, valid = 0;
        Workspace ws = workspace.get();
        if (ws.scoreValues.length < n) { ws.scoreValues = new float[n]; ws.scoreDiff = new float[n]; }
        float[] fs = ws.scoreValues, diff = ws.scoreDiff;
        for (int i = 0; i < n; i++) {
            double x = ref.scoreX[i], y = ref.scoreY[i];
            double z = m[6] * x + m[7] * y + m[8];
            float f = Filters.bilinear(img, w, hh, (m[0] * x + m[1] * y + m[2]) / z, (m[3] * x + m[4] * y + m[5]) / z);
            fs[i] = f;
            if (f == f) diff[valid++] = f - ref.scoreT[i];
        }
        double visible = n == 0 ? 0 : valid / (double) n;
        if (visible < config.minVisibleFraction() || valid < 16)
            return new Grade(h, RegistrationStatus.FAILED, String.format(Locale.ROOT,
                    "only %.0f %% of the board inside the frame", 100 * visible), Double.NaN, Double.NaN, 0);
        double offset = OrderStatistics.select(diff, valid, valid / 2);
        for (int i = 0; i < valid; i++) diff[i] = Math.abs(diff[i] - (float) offset);
        double sigma = 1.4826 * OrderStatistics.select(diff, valid, valid / 2);
        // similarity: normalised cross-correlation over the board pixels that did not change (residual within
        // 3 robust standard deviations); the changed fraction is reported separately
        double sf = 0, sf2 = 0, sft = 0, st = 0, st2 = 0;
        int kept = 0;
        for (int i = 0; i < n; i++) {
            float f = fs[i];
            if (f != f) continue;
            float t = ref.scoreT[i];
            if (Math.abs(f - t - offset) > 3 * sigma) continue;
            kept++;
            sf += f; sf2 += f * f; sft += f * t; st += t; st2 += t * t;
        }
        double changed = 1 - kept / (double) valid;
        double similarity = kept > 16 ? CoarseSearch.ncc(sf, sf2, sft, st, st2, kept) : 0;
        // local patch check
        int checked = 0, agree = 0;
        double sum2 = 0;
        double[] pts = new double[4 * ref.patches.size()];
        float[] buf = new float[ref.patches.isEmpty() ? 0 : ref.patches.get(0).t.length];
        for (ReferenceModel.Patch p : ref.patches) {
            double[] d = patchShift(p, img, w, hh, m, offset, buf);
            if (d == null) continue;
            checked++;
            double r = Math.hypot(d[0], d[1]);
            if (d[2] > 0 && r <= 1.0) {
                pts[4 * agree] = p.cx; pts[4 * agree + 1] = p.cy; pts[4 * agree + 2] = d[0]; pts[4 * agree + 3] = d[1];
                agree++;
                sum2 += r * r;
            }
        }
        double rms = agree > 0 ? Math.sqrt(sum2 / agree) : Double.NaN;
        double[] patchStats = patchCornerStats(pts, agree, ref.referenceCornersPx);
        MappingUncertainty unc = MappingUncertainty.direct(alignVariance, patchStats[0], patchStats[1], zoom(h));
        double fraction = checked > 0 ? agree / (double) checked : 0;
        StringBuilder weak = new StringBuilder();
        String fail = null;
        if (changed > 0.5)
            fail = String.format(Locale.ROOT, "%.0f %% of the board differs from the reference", 100 * changed);
        else if (similarity < config.failSimilarity())
            fail = String.format(Locale.ROOT, "image similarity %.2f over the board is below %.2f: the frame does not "
                    + "match the reference", similarity, config.failSimilarity());
        else if (checked >= 3 && fraction < config.failInlierFraction())
            fail = String.format(Locale.ROOT, "only %d of %d check patches agree with the mapping", agree, checked);
        else if (rms > config.failRmsPx())
            fail = String.format(Locale.ROOT, "check patches disagree by %.2f px RMS", rms);
        double cornerSigma = unc.cornerSigmaPx();
        if (fail == null && cornerSigma > FAIL_SIGMA_PX)
            fail = String.format(Locale.ROOT, "estimated corner error %.2f px", cornerSigma);
        if (fail != null) return new Grade(h, RegistrationStatus.FAILED, fail, similarity, rms, agree, unc);
        if (cornerSigma > OK_SIGMA_PX)
            weak.append(String.format(Locale.ROOT, "estimated corner error %.2f px; ", cornerSigma));
        if (similarity < config.okSimilarity())
            weak.append(String.format(Locale.ROOT, "image similarity %.2f below %.2f; ", similarity, config.okSimilarity()));
        if (checked < 3) weak.append("too few textured patches to check the mapping; ");
        else if (agree < MIN_AGREEING_PATCHES_OK)
            weak.append(String.format(Locale.ROOT, "only %d check patches agree; ", agree));
        else if (fraction < config.okInlierFraction())
            weak.append(String.format(Locale.ROOT, "%d of %d check patches agree; ", agree, checked));
        if (rms > config.okRmsPx()) weak.append(String.format(Locale.ROOT, "check patches disagree by %.2f px RMS; ", rms));
        if (changed > 0.25)
            weak.append(String.format(Locale.ROOT, "%.0f %% of the board differs from the reference; ", 100 * changed));
        if (visible < 0.9) weak.append(String.format(Locale.ROOT, "%.0f %% of the board inside the frame; ", 100 * visible));
        if (!converged) weak.append("refinement did not settle; ");
        if (weak.length() > 0) {
            weak.setLength(weak.length() - 2);
            return new Grade(h, RegistrationStatus.WEAK, weak.toString(), similarity, rms, agree, unc);
        }
        return new Grade(h, RegistrationStatus.OK, null, similarity, rms, agree, unc);
    }

    /**
     * Residual translation {dx, dy, converged} of one patch, or null when the patch falls outside the frame or holds
     * no texture there. The board-wide robust offset applies; neither a per-patch offset nor a per-patch gain (even
     * a negative one for inverted contrast) helped on simulated series: they let patches settle on wrong structure
     * (a 0.9 px wrong stand frame passed) and made the stand's mean error worse.
     */
    private static double[] patchShift(ReferenceModel.Patch p, float[] img, int w, int h, double[] m, double offset,
                                       float[] buf) {
        double dx = 0, dy = 0;
        int n = p.t.length;
        for (int it = 0; it < 10; it++) {
            double sf = 0, sf2 = 0, sft = 0, st = 0;
            for (int k = 0; k < n; k++) {
                double x = p.cx + p.dx[k] + dx, y = p.cy + p.dy[k] + dy;
                double z = m[6] * x + m[7] * y + m[8];
                float f = Filters.bilinear(img, w, h, (m[0] * x + m[1] * y + m[2]) / z, (m[3] * x + m[4] * y + m[5]) / z);
                if (f != f) return null;
                buf[k] = f;
                sf += f; sf2 += f * f; sft += f * p.t[k]; st += p.t[k];
            }
            double vf = sf2 - sf * sf / n;
            if (!(vf > 1e-12)) return null;
            double a = 1, b = -offset;
            double bx = 0, by = 0;
            for (int k = 0; k < n; k++) {
                double e = a * buf[k] + b - p.t[k];
                bx += p.gx[k] * e;
                by += p.gy[k] * e;
            }
            double sx = p.i11 * bx + p.i12 * by, sy = p.i12 * bx + p.i22 * by;
            dx -= sx;
            dy -= sy;
            if (Math.hypot(dx, dy) > 3) return new double[]{dx, dy, 0};
            if (Math.hypot(sx, sy) < 0.01) return new double[]{dx, dy, 1};
        }
        return new double[]{dx, dy, 0};
    }

    /**
     * The similarity correction (shift, rotation, zoom; closed-form least squares) fitted to the agreeing patches'
     * residual shifts, evaluated at the reference's board corners: patches can all agree within a fraction of a pixel
     * while a small rotation or zoom error grows to more than a pixel at the corners, where the analysis' outline is
     * measured. A similarity rather than an affine fit: the extra two parameters extrapolated patch noise to about
     * 1 px at the corners of frames that were 0.05 px off.
     *
     * <p>Returned: {mean squared displacement at the corners, mean variance of that displacement from the fit's
     * residuals (s^2 (A^T A)^-1 propagated, 2n - 4 degrees of freedom)}; NaN where too few patches.
     */
    static double[] patchCornerStats(double[] pts, int n, double[][] corners) {
        if (n < 3) return new double[]{Double.NaN, Double.NaN};
        double mx = 0, my = 0, tx = 0, ty = 0;
        for (int i = 0; i < n; i++) {
            mx += pts[4 * i] / n; my += pts[4 * i + 1] / n; tx += pts[4 * i + 2] / n; ty += pts[4 * i + 3] / n;
        }
        double sa = 0, sb = 0, sr = 0;
        for (int i = 0; i < n; i++) {
            double x = pts[4 * i] - mx, y = pts[4 * i + 1] - my, dx = pts[4 * i + 2] - tx, dy = pts[4 * i + 3] - ty;
            sa += x * dx + y * dy;
            sb += x * dy - y * dx;
            sr += x * x + y * y;
        }
        if (!(sr > 1e-9)) return new double[]{Double.NaN, Double.NaN};
        double a = sa / sr, b = sb / sr, rss = 0;
        for (int i = 0; i < n; i++) {
            double x = pts[4 * i] - mx, y = pts[4 * i + 1] - my;
            double ex = pts[4 * i + 2] - (a * x - b * y + tx), ey = pts[4 * i + 3] - (b * x + a * y + ty);
            rss += ex * ex + ey * ey;
        }
        double bias2 = 0, noise = 0;
        // with centred coordinates the four parameters are uncorrelated: var(tx) = var(ty) = s^2 / n,
        // var(a) = var(b) = s^2 / sr
        double s2 = 2 * n > 4 ? rss / (2 * n - 4) : Double.NaN;
        for (double[] c : corners) {
            double x = c[0] - mx, y = c[1] - my;
            double ux = a * x - b * y + tx, uy = b * x + a * y + ty;
            bias2 += (ux * ux + uy * uy) / corners.length;
            noise += s2 * (2.0 / n + 2 * (x * x + y * y) / sr) / corners.length;
        }
        return new double[]{bias2, n >= 5 ? noise : Double.NaN};
    }

    /** Frame pixels per reference pixel at the reference's board centre (square root of the Jacobian determinant). */
    private double zoom(Homography h) {
        double[][] c = ref.referenceCornersPx;
        double cx = 0, cy = 0;
        for (double[] p : c) { cx += p[0] / 4; cy += p[1] / 4; }
        double[] a = h.apply(cx - 1, cy), b = h.apply(cx + 1, cy), d = h.apply(cx, cy - 1), e = h.apply(cx, cy + 1);
        double jxx = (b[0] - a[0]) / 2, jyx = (b[1] - a[1]) / 2, jxy = (e[0] - d[0]) / 2, jyy = (e[1] - d[1]) / 2;
        return Math.sqrt(Math.abs(jxx * jyy - jxy * jyx));
    }


}
