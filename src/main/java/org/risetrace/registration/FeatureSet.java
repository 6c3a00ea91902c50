package org.risetrace.registration;

import boofcv.abst.feature.associate.AssociateDescription;
import boofcv.abst.feature.associate.ScoreAssociation;
import boofcv.abst.feature.detdesc.DetectDescribePoint;
import boofcv.abst.feature.detect.interest.ConfigFastHessian;
import boofcv.factory.feature.associate.ConfigAssociateGreedy;
import boofcv.factory.feature.associate.FactoryAssociation;
import boofcv.factory.feature.detdesc.FactoryDetectDescribe;
import boofcv.factory.geo.ConfigRansac;
import boofcv.factory.geo.FactoryMultiViewRobust;
import boofcv.struct.feature.AssociatedIndex;
import boofcv.struct.feature.TupleDesc_F64;
import boofcv.struct.geo.AssociatedPair;
import boofcv.struct.image.GrayF32;
import georegression.struct.homography.Homography2D_F64;
import georegression.struct.point.Point2D_F64;
import org.ddogleg.fitting.modelset.ModelMatcher;
import org.ddogleg.struct.FastAccess;
import org.ddogleg.struct.FastArray;

import java.util.ArrayList;
import java.util.List;

/**
 * Interest points with descriptors (BoofCV's fast SURF: Bay et al. 2008) of one image, and the per-thread matcher
 * that associates them with another image's and fits a homography by RANSAC (Fischler and Bolles 1981).
 * Detection runs on the band-passed image scaled to unit spread, so board warming does not shift it.
 */
final class FeatureSet {
    final double[] x, y;
    final FastArray<TupleDesc_F64> descriptions;

    private FeatureSet(double[] x, double[] y, FastArray<TupleDesc_F64> d) {
        this.x = x; this.y = y; this.descriptions = d;
    }

    static {
        // frames are registered one per worker thread already; BoofCV's own worker threads would only contend
        boofcv.concurrency.BoofConcurrency.USE_CONCURRENT = false;
    }

    int size() { return x.length; }

    static DetectDescribePoint<GrayF32, TupleDesc_F64> detector() {
        ConfigFastHessian hessian = new ConfigFastHessian(0, 2, 150, 1, 9, 4, 4);
        return FactoryDetectDescribe.surfStable(hessian, null, null, GrayF32.class);
    }

    /** Features of img, keeping those inside the quad (grown by marginPx) when corners is not null. */
    static FeatureSet detect(float[] img, int w, int h, double[][] corners, double marginPx) {
        return detect(detector(), new GrayF32(w, h), img, w, h, corners, marginPx);
    }

    static FeatureSet detect(DetectDescribePoint<GrayF32, TupleDesc_F64> det, GrayF32 gray, float[] img, int w, int h,
                             double[][] corners, double marginPx) {
        if (gray.width != w || gray.height != h) gray.reshape(w, h);
        double s = 0, s2 = 0;
        for (float v : img) { s += v; s2 += v * v; }
        double m = s / img.length, sd = Math.sqrt(Math.max(1e-20, s2 / img.length - m * m));
        float k = (float) (50 / sd);
        for (int i = 0; i < img.length; i++) gray.data[i] = (float) ((img[i] - m) * k + 128);
        det.detect(gray);
        List<double[]> keep = new ArrayList<>();
        FastArray<TupleDesc_F64> d = new FastArray<>(TupleDesc_F64.class);
        for (int i = 0; i < det.getNumberOfFeatures(); i++) {
            Point2D_F64 p = det.getLocation(i);
            if (corners != null && !ReferenceModel.insideBy(corners, p.x, p.y, marginPx)) continue;
            keep.add(new double[]{p.x, p.y});
            d.add(det.getDescription(i).copy());
        }
        double[] xs = new double[keep.size()], ys = new double[keep.size()];
        for (int i = 0; i < keep.size(); i++) { xs[i] = keep.get(i)[0]; ys[i] = keep.get(i)[1]; }
        return new FeatureSet(xs, ys, d);
    }

    /** One thread's detector, associator and robust estimator. */
    static final class Matcher {
        private final DetectDescribePoint<GrayF32, TupleDesc_F64> det = detector();
        private final GrayF32 gray = new GrayF32(1, 1);
        private final AssociateDescription<TupleDesc_F64> associate;
        private final ModelMatcher<Homography2D_F64, AssociatedPair> ransac;

        Matcher(double inlierPx) {
            ScoreAssociation<TupleDesc_F64> score = FactoryAssociation.scoreEuclidean(TupleDesc_F64.class, true);
            associate = FactoryAssociation.greedy(new ConfigAssociateGreedy(true, 0.9), score);
            ConfigRansac cr = new ConfigRansac(800, inlierPx);
            cr.randSeed = 0xB0A2D; // deterministic results for the same frames
            ransac = FactoryMultiViewRobust.homographyRansac(null, cr);
        }

        /** Reference-to-frame homography (full-resolution pixels) or null; inliers[0] receives the inlier count. */
        Homography match(FeatureSet ref, float[] img, int w, int h, int[] inliers) {
            inliers[0] = 0;
            if (ref == null || ref.size() < 8) return null;
            FeatureSet cur = detect(det, gray, img, w, h, null, 0);
            if (cur.size() < 8) return null;
            associate.setSource(ref.descriptions);
            associate.setDestination(cur.descriptions);
            associate.associate();
            FastAccess<AssociatedIndex> m = associate.getMatches();
            List<AssociatedPair> pairs = new ArrayList<>(m.size);
            for (int i = 0; i < m.size; i++) {
                AssociatedIndex a = m.get(i);
                pairs.add(new AssociatedPair(ref.x[a.src], ref.y[a.src], cur.x[a.dst], cur.y[a.dst]));
            }
            if (pairs.size() < 8 || !ransac.process(pairs)) return null;
            inliers[0] = ransac.getMatchSet().size();
            if (inliers[0] < 8) return null;
            Homography2D_F64 g = ransac.getModelParameters();
            return new Homography(new double[]{g.a11, g.a12, g.a13, g.a21, g.a22, g.a23, g.a31, g.a32, g.a33})
                    .normalized();
        }
    }
}
