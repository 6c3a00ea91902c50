package org.risetrace.planning;

/**
 * How fast a short's power shows on the board, for the planner's "too little heat" check and its capture settings.
 *
 * <p>Model: the board is a plate of FR-4 (1.6 mm) plus plane copper, insulated faces, and the short is a continuous
 * line source through its thickness switched on at t = 0. The rise at distance r after time t is
 * dT = P / (4 pi (k t)) E1(r^2 / (4 alpha t)) with (k t) the plate's conductance-thickness and alpha = (k t) / (rho c t)
 * its in-plane diffusivity (Carslaw and Jaeger, Conduction of Heat in Solids, 2nd ed. 1959, ch. 10: continuous line
 * source in an infinite medium). We evaluate it at the edge of the spot the camera sees (r = the spot radius).
 *
 * <p>Why not the package's own heat capacity: a small package holds about a millijoule per kelvin (an 0603 ceramic
 * body, 1.6 x 0.8 x 0.8 mm of barium titanate at about 2.9 J/cm^3K, from memory) and would promise kelvins from
 * milliwatts; within a minute the heat spreads centimetres into the copper (diffusion length sqrt(alpha t) = 2 cm on
 * a two-layer board), so the board, not the package, sets the rise. The faces' losses to air are left out: the model
 * overstates the rise, so when it says the rise is too small, it surely is.
 */
public final class BoardHeating {
    /**
     * FR-4 conductivity W/mK, as sim.Materials: 0.30 is the through-plane figure (measured 0.343 through, 1.059 along
     * the plane; Sarvar, Poole and Witting, J. Electronic Materials 19 (1990) 1345). Kept low on purpose here: less
     * spreading overstates the rise, the safe side for "the rise is too small" (see above).
     */
    static final double FR4_K = 0.30;
    /** FR-4 volumetric heat capacity J/m^3K: 1850 kg/m^3 x 1100 J/kgK (laminate datasheets, from memory). */
    static final double FR4_RHO_C = 1850.0 * 1100.0;
    /** Board thickness, m: 1.6 mm (common practice). */
    static final double FR4_THICKNESS_M = 1.6e-3;
    /** Copper conductivity W/mK: 401 for pure copper at 300 K, PCB copper a little lower (Incropera and DeWitt, Table A.1, from memory). */
    static final double COPPER_K = 390.0;
    /** Copper volumetric heat capacity J/m^3K: 8933 kg/m^3 x 385 J/kgK (Incropera and DeWitt, Table A.1, from memory). */
    static final double COPPER_RHO_C = 8933.0 * 385.0;
    /**
     * Heat loss per face to still air, W/m^2K: natural convection about 6 (Incropera and DeWitt, ch. 9, small
     * horizontal plates, from memory) plus linearised radiation 4 e sigma T^3 = 5.3 at e = 0.9, 296 K.
     */
    static final double FACE_LOSS_W_PER_M2K = 6.0 + 4 * 0.9 * 5.670374419e-8 * 296.0 * 296.0 * 296.0;
    /** Euler-Mascheroni constant (A&S 6.1.3). */
    private static final double EULER_GAMMA = 0.5772156649015329;

    private final double conductanceThicknessWPerK;
    private final double heatCapacityPerAreaJPerM2K;

    /** A 1.6 mm FR-4 board with {@code copperUm} micrometres of plane copper in total. */
    public BoardHeating(double copperUm) {
        if (!(copperUm >= 0)) throw new IllegalArgumentException("copper thickness must be >= 0 um");
        double cu = copperUm * 1e-6;
        conductanceThicknessWPerK = FR4_K * FR4_THICKNESS_M + COPPER_K * cu;
        heatCapacityPerAreaJPerM2K = FR4_RHO_C * FR4_THICKNESS_M + COPPER_RHO_C * cu;
    }

    /** In-plane thermal diffusivity of the plate, m^2/s. */
    public double diffusivityM2PerS() {
        return conductanceThicknessWPerK / heatCapacityPerAreaJPerM2K;
    }

    /** The plate's conductance-thickness k t, W/K. */
    public double conductanceThicknessWPerK() {
        return conductanceThicknessWPerK;
    }

    /** Rise in kelvin at {@code radiusM} from a source of {@code powerW} switched on {@code tS} seconds ago. */
    public double riseK(double powerW, double radiusM, double tS) {
        if (!(tS > 0) || !(radiusM > 0)) throw new IllegalArgumentException("t and r must be > 0");
        double u = radiusM * radiusM / (4 * diffusivityM2PerS() * tS);
        return powerW / (4 * Math.PI * conductanceThicknessWPerK) * e1(u);
    }

    /**
     * Time constant of the whole board's approach to its steady state, s: heat capacity per area over the loss of
     * both faces, rho c t / (2 h). The rise curves' tails follow it.
     */
    public double boardTimeConstantS() {
        return heatCapacityPerAreaJPerM2K / (2 * FACE_LOSS_W_PER_M2K);
    }

    /**
     * The lock-in period whose thermal diffusion length mu = sqrt(alpha T / pi) equals {@code lengthM}, s
     * (Breitenstein and Langenkamp, Lock-in Thermography, Springer 2003, ch. 2: mu = sqrt(2 alpha / omega)):
     * shorter periods keep the heat within that distance of its source.
     */
    public double lockInPeriodS(double lengthM) {
        return Math.PI * lengthM * lengthM / diffusivityM2PerS();
    }

    /**
     * The exponential integral E1(x) = integral from x to infinity of exp(-t)/t dt, x > 0: the series
     * -gamma - ln x - sum (-x)^k / (k k!) below 1 (A&S 5.1.11), the continued fraction above (A&S 5.1.22, evaluated
     * by the modified Lentz method).
     */
    public static double e1(double x) {
        if (!(x > 0)) throw new IllegalArgumentException("E1 needs x > 0, got " + x);
        if (x < 1) {
            double sum = 0, term = 1;
            for (int k = 1; k < 100; k++) {
                term *= -x / k;
                double add = -term / k;
                sum += add;
                if (Math.abs(add) < 1e-17 * Math.abs(sum)) break;
            }
            return -EULER_GAMMA - Math.log(x) + sum;
        }
        // E1(x) = exp(-x) / (x + 1 - 1/(x + 3 - 4/(x + 5 - ...))), the even contraction of A&S 5.1.22
        double tiny = 1e-300;
        double b = x + 1, c = 1 / tiny, d = 1 / b, h = d;
        for (int i = 1; i < 200; i++) {
            double a = -(double) i * i;
            b += 2;
            d = 1 / (a * d + b);
            c = b + a / c;
            double del = c * d;
            h *= del;
            if (Math.abs(del - 1) < 1e-16) break;
        }
        return h * Math.exp(-x);
    }
}
