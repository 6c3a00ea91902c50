package org.risetrace.planning;

import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.annotation.JsonPropertyOrder;

/**
 * What the technician knows before injecting. Checked once here; a bad value is an IllegalArgumentException whose
 * message names the quantity (the CLI turns it into a usage error, the series.json reader into InputRejected).
 *
 * @param topology         where the leads go
 * @param rail             the rail injected into (rail-to-ground) or the converter's output rail (across-switch)
 * @param railNominalV     that rail's nominal voltage against ground
 * @param highRail         across-switch: the higher rail the positive lead goes to (null otherwise)
 * @param highRailNominalV across-switch: its nominal voltage against ground
 * @param measuredOhms     resistance measured between the two points the leads go to
 * @param pathOhms         of it, the part outside the short (inductor DCR, traces, leads); 0 when unknown
 * @param supplyMaxV       the most voltage the supply can (or may) give
 * @param supplyMaxA       the most current the supply can (or may) give
 * @param requestedV       the voltage the technician wants to set (null: the highest allowed)
 * @param wantedPowerW     the power wanted in the short (null: as much as the supply's current allows)
 * @param netdK            the camera's noise-equivalent temperature difference
 * @param batteryConnected a lithium cell (or any battery) is still connected to the board
 * @param mainsConnected   the mains input is still connected
 * @param spotRadiusMm     radius over which the camera sees the short's package (heating estimate)
 * @param copperUm         total thickness of the board's plane copper (heating estimate: more copper, less rise)
 * @param partSpacingMm    distance between the neighbouring parts to tell apart (lock-in period)
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
@JsonPropertyOrder({"topology", "rail", "rail_nominal_v", "high_rail", "high_rail_nominal_v", "measured_ohms",
        "path_ohms", "supply_max_v", "supply_max_a", "requested_v", "wanted_power_w", "netd_k", "battery_connected",
        "mains_connected", "spot_radius_mm", "copper_um", "part_spacing_mm"})
public record PlanRequest(
        @JsonProperty("topology") Topology topology,
        @JsonProperty("rail") String rail,
        @JsonProperty("rail_nominal_v") double railNominalV,
        @JsonProperty("high_rail") String highRail,
        @JsonProperty("high_rail_nominal_v") Double highRailNominalV,
        @JsonProperty("measured_ohms") double measuredOhms,
        @JsonProperty("path_ohms") Double pathOhms,
        @JsonProperty("supply_max_v") double supplyMaxV,
        @JsonProperty("supply_max_a") double supplyMaxA,
        @JsonProperty("requested_v") Double requestedV,
        @JsonProperty("wanted_power_w") Double wantedPowerW,
        @JsonProperty("netd_k") Double netdK,
        @JsonProperty("battery_connected") boolean batteryConnected,
        @JsonProperty("mains_connected") boolean mainsConnected,
        @JsonProperty("spot_radius_mm") Double spotRadiusMm,
        @JsonProperty("copper_um") Double copperUm,
        @JsonProperty("part_spacing_mm") Double partSpacingMm) {

    /** A typical microbolometer's NETD, 50 mK (common practice: bench thermal cameras are specified at 40-70 mK). */
    public static final double DEFAULT_NETD_K = 0.05;
    /** A small package as the camera sees it: about 2 mm across. */
    public static final double DEFAULT_SPOT_RADIUS_MM = 1.0;
    /** Two full 35 um (1 oz) planes: a plain two-layer board; multilayer boards have more (common practice). */
    public static final double DEFAULT_COPPER_UM = 70.0;
    /** Neighbouring small parts sit a few millimetres apart (common practice). */
    public static final double DEFAULT_PART_SPACING_MM = 3.0;

    public PlanRequest {
        if (topology == null) throw new IllegalArgumentException("the topology is missing (rail-to-ground or across-switch)");
        if (rail == null || rail.isBlank()) rail = topology == Topology.RAIL_TO_GROUND ? "rail" : "output rail";
        positive(railNominalV, "the rail's nominal voltage", "V");
        if (topology == Topology.ACROSS_SWITCH) {
            if (highRailNominalV == null)
                throw new IllegalArgumentException("across-switch injection needs the higher rail's nominal voltage");
            positive(highRailNominalV, "the higher rail's nominal voltage", "V");
            if (!(highRailNominalV > railNominalV))
                throw new IllegalArgumentException("the higher rail's nominal voltage (" + highRailNominalV
                        + " V) must be above the output rail's (" + railNominalV + " V)");
            if (highRail == null || highRail.isBlank()) highRail = "higher rail";
        } else if (highRailNominalV != null || highRail != null) {
            throw new IllegalArgumentException("a higher rail is only used with the across-switch topology");
        }
        positive(measuredOhms, "the measured resistance", "ohm");
        if (pathOhms == null) pathOhms = 0.0;
        if (!(pathOhms >= 0 && pathOhms < measuredOhms))
            throw new IllegalArgumentException("the path resistance must be at least 0 and below the measured "
                    + "resistance (" + measuredOhms + " ohm), got " + pathOhms);
        positive(supplyMaxV, "the supply's voltage limit", "V");
        positive(supplyMaxA, "the supply's current limit", "A");
        if (requestedV != null) positive(requestedV, "the requested voltage", "V");
        if (wantedPowerW != null) positive(wantedPowerW, "the wanted power", "W");
        if (netdK == null) netdK = DEFAULT_NETD_K;
        positive(netdK, "the camera's NETD", "K");
        if (spotRadiusMm == null) spotRadiusMm = DEFAULT_SPOT_RADIUS_MM;
        positive(spotRadiusMm, "the spot radius", "mm");
        if (copperUm == null) copperUm = DEFAULT_COPPER_UM;
        if (!(copperUm >= 0 && copperUm < 10_000))
            throw new IllegalArgumentException("the plane copper must be 0 to 10000 um, got " + copperUm);
        if (partSpacingMm == null) partSpacingMm = DEFAULT_PART_SPACING_MM;
        positive(partSpacingMm, "the part spacing", "mm");
    }

    private static void positive(double v, String what, String unit) {
        if (!(v > 0 && Double.isFinite(v)))
            throw new IllegalArgumentException(what + " must be a positive number of " + unit + ", got " + v);
    }

    /** The rail whose voltage against ground the supply's setting becomes if the short opens. */
    public String railAgainstGround() {
        return topology == Topology.ACROSS_SWITCH ? highRail : rail;
    }

    /** That rail's nominal voltage: the highest voltage the plan may ever set. */
    public double ceilingV() {
        return topology == Topology.ACROSS_SWITCH ? highRailNominalV : railNominalV;
    }

    /** The resistance of the short itself (measured minus path). */
    public double shortOhms() {
        return measuredOhms - pathOhms;
    }
}
