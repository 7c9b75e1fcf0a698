/**
 * Default physics of a room and of a unit's air side. Each constant says where
 * it comes from: a handbook formula, "common practice, no published source", or
 * "from memory" (a recalled figure, to be checked before anyone relies on it).
 * These are a simulator's round numbers for a small room; they do not replace a
 * heat-load calculation for a real building.
 */

/**
 * Effective heat capacity of a ~30 m² room, J/K: the air alone is
 * ρ·c_p·V = 1.2 kg/m³ · 1005 J/(kg·K) · 80 m³ ≈ 96 kJ/K (air properties from
 * any thermodynamics handbook); furnishings and the inner layers of walls that
 * follow the air within an hour add several times that (factor about 6 from
 * memory), so 600 kJ/K.
 */
export const DEFAULT_ROOM_HEAT_CAPACITY_J_PER_K = 600_000;

/**
 * Envelope loss of that room to the outdoor air, W/K: two outside walls of
 * about 20 m² at U ≈ 0.5 W/(m²·K) (10 W/K), 8 m² of windows at U ≈ 1.3
 * W/(m²·K) (10 W/K), and one air change per hour of ventilation,
 * ρ·c_p/3600 · 80 m³ ≈ 27 W/K (handbook air properties); U values from
 * memory. Rounded to 50 W/K, so τ = C/UA = 12,000 s (3.3 h) for the room alone.
 */
export const DEFAULT_ROOM_UA_W_PER_K = 50;

/** Outdoor temperature when neither the room nor the device names one, °C (a mild day; invented). */
export const DEFAULT_OUTDOOR_C = 10;

/**
 * Supply air temperature of a heat pump indoor unit while heating, °C: 35-50 °C
 * at the outlet is usual (common practice, no published source); 45 °C taken.
 * A room heated by it can never pass it.
 */
export const HEATING_SUPPLY_C = 45;

/**
 * Supply air temperature while cooling, °C: 10-15 °C at the outlet is usual
 * (common practice, no published source); 12 °C taken.
 */
export const COOLING_SUPPLY_C = 12;

/**
 * Room temperatures at which a unit's nominal capacity is stated, °C: 20 °C
 * indoor for heating and 27 °C indoor for cooling are the usual rating
 * conditions of air-to-air units (from memory). The air-side conductance is
 * capacity / (supply − rating temperature), so the unit delivers its nominal
 * capacity there and less as the room approaches the supply temperature.
 */
export const HEATING_RATING_ROOM_C = 20;
export const COOLING_RATING_ROOM_C = 27;

/**
 * Width of the band a running unit holds the room in, K: the compressor (or
 * valve) stops at setpoint + band/2 and restarts at setpoint − band/2 (mirrored
 * when cooling). About 1 K is usual for on/off control (common practice, no
 * published source).
 */
export const DEFAULT_CYCLE_BAND_K = 1;
