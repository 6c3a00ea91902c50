package org.risetrace.sim;

import java.util.Locale;

/**
 * Material constants of the board model, each with its source. Values marked "from memory" are handbook values
 * recalled, not looked up again; they are typical, and the scenario file can override every one that matters.
 */
public final class Materials {
    private Materials() {
    }

    /** Stefan-Boltzmann constant, W m^-2 K^-4 (CODATA 2018). */
    public static final double STEFAN_BOLTZMANN = 5.670374419e-8;

    /** Copper in-plane conductivity, W/mK: pure copper 401 at 300 K (Incropera & DeWitt, Table A.1, from memory); electrodeposited PCB copper is a little lower, about 385-395 (from memory). */
    public static final double COPPER_K = 390.0;
    /** Copper density kg/m^3 (Incropera & DeWitt, Table A.1: 8933, from memory). */
    public static final double COPPER_RHO = 8933.0;
    /** Copper specific heat J/kgK (Incropera & DeWitt, Table A.1: 385, from memory). */
    public static final double COPPER_C = 385.0;

    /** FR-4 in-plane conductivity W/mK, about 0.3 in-plane, 0.25-0.3 through the laminate (laminate datasheets, from memory). */
    public static final double FR4_K = 0.30;
    /** FR-4 density kg/m^3, 1800-1900 (laminate datasheets, from memory). */
    public static final double FR4_RHO = 1850.0;
    /** FR-4 specific heat J/kgK, 1100-1200 (laminate datasheets, from memory). */
    public static final double FR4_C = 1100.0;

    /** Solder mask (green epoxy ink) long-wave emissivity, about 0.9 (IR thermography emissivity tables, from memory). */
    public static final double SOLDER_MASK_EMISSIVITY = 0.90;
    /** Silkscreen ink, a little below the mask (assumed, from memory: white epoxy inks 0.85-0.9). */
    public static final double SILKSCREEN_EMISSIVITY = 0.86;
    /** Tinned leads and hot-air-levelled copper, 0.1-0.3 (IR thermography emissivity tables, from memory). */
    public static final double TINNED_LEAD_EMISSIVITY = 0.20;
    /** Black epoxy moulded package, about 0.9-0.95 (from memory). */
    public static final double EPOXY_PACKAGE_EMISSIVITY = 0.92;
    /** Ceramic capacitor body, about 0.9 (from memory). */
    public static final double CERAMIC_EMISSIVITY = 0.90;
    /** Ferrite or powdered-iron inductor body, about 0.9 (from memory). */
    public static final double INDUCTOR_BODY_EMISSIVITY = 0.90;
    /** Nickel-plated metal top of a power switch package, 0.05-0.15 (from memory; calibration/materials.json says 0.10). */
    public static final double METAL_TOP_EMISSIVITY = 0.10;
    /** Vinyl or rubber bench mat, about 0.95 (from memory). */
    public static final double BENCH_MAT_EMISSIVITY = 0.95;

    /** Contact conductance per footprint area from a part's body to the board under it, W/m^2K (assumed: 5 x 6 mm gives about 11 K/W). */
    public static final double CONTACT_W_PER_M2K = 3000.0;

    /**
     * Volumetric heat capacity rho*c of a part's body in J/m^3K by kind: epoxy mould compound about 1.9e3 kg/m^3 x 0.9e3
     * J/kgK; barium-titanate ceramic about 5.8e3 x 0.5e3; ferrite about 4.8e3 x 0.75e3 (all from memory).
     */
    public static double volumetricHeatCapacity(String kind) {
        return switch (kind == null ? "" : kind.toLowerCase(Locale.ROOT)) {
            case "capacitor" -> 2.9e6;
            case "inductor" -> 3.6e6;
            default -> 1.7e6;
        };
    }

    /** Default body emissivity by kind. */
    public static double bodyEmissivity(String kind) {
        return switch (kind == null ? "" : kind.toLowerCase(Locale.ROOT)) {
            case "capacitor", "resistor" -> CERAMIC_EMISSIVITY;
            case "inductor" -> INDUCTOR_BODY_EMISSIVITY;
            default -> EPOXY_PACKAGE_EMISSIVITY;
        };
    }

    /**
     * Linearised radiative film coefficient 4*e*sigma*T^3 at absolute temperature T (Incropera & DeWitt, eq. 1.9,
     * radiation heat transfer coefficient about the surroundings' temperature).
     */
    public static double radiativeH(double emissivity, double kelvin) {
        return 4.0 * emissivity * STEFAN_BOLTZMANN * kelvin * kelvin * kelvin;
    }
}
