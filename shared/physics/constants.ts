/**
 * @module shared/physics/constants
 * Named physical constants and screening defaults of the plume engine, each with its unit
 * and its science.md label: (a) published, (b) from memory, (c) common practice / derived.
 */

/**
 * Gravitational acceleration used for reduced gravity [m s⁻²].
 * (c) common practice: science.md §1.2 ("g = 9.81 m s⁻²"); the §1.10 worked example and
 * the §8 check values #18–#27 use this value.
 */
export const GRAVITY = 9.81;

/**
 * Standard gravity [m s⁻²], for reference only (not used by the plume scalings).
 * (a) published: science.md §1.2 (standard gravity 9.80665 m s⁻²).
 */
export const STANDARD_GRAVITY = 9.80665;

/**
 * Reference (ambient) density ρ0 in g′ = g Δρ/ρ0 [kg m⁻³].
 * (c) common practice: science.md §1.2 (ρ0 = 1025; choosing 1000 changes g′ by 2.5 %).
 */
export const REFERENCE_DENSITY = 1025;

/**
 * Angular velocity of the Earth Ω [rad s⁻¹].
 * (a) published: WGS 84 / EPSG:7030 remarks (ω = 7292115e-11 rad s⁻¹), science.md §3.
 */
export const EARTH_ANGULAR_VELOCITY = 7.292115e-5;

/**
 * Factor converting ITS-90 to IPTS-68 temperature: t68 = 1.00024 · t90 [–].
 * (a) published: science.md §2.1 (UNESCO EOS-80 is defined on IPTS-68).
 */
export const ITS90_TO_IPTS68 = 1.00024;

/** Lowest practical salinity accepted by EOS-80 [PSS-78]. (a) published: science.md §2.1. */
export const EOS80_MIN_SALINITY = 0;
/** Highest practical salinity accepted by EOS-80 [PSS-78]. (a) published: science.md §2.1. */
export const EOS80_MAX_SALINITY = 42;
/** Lowest ITS-90 temperature accepted by the engine [°C]. (a) published: science.md §2.1 (−2 °C). */
export const EOS80_MIN_TEMPERATURE = -2;
/** Highest ITS-90 temperature accepted by the engine [°C]. (a) published: science.md §2.1 (40 °C). */
export const EOS80_MAX_TEMPERATURE = 40;
/**
 * Highest sea pressure of the published EOS-80 validity range [dbar].
 * (a) published: science.md §2.1 (0 ≤ p ≤ 10 000 dbar).
 */
export const EOS80_MAX_PRESSURE_DBAR = 10_000;
/**
 * Highest sea pressure the engine accepts [dbar] (the API contract allows up to 11 000 dbar,
 * the deepest ocean). Between 10 000 and 11 000 dbar EOS-80 is an extrapolation.
 * (c) common practice / derived: deepest trench ≈ 11 000 dbar.
 */
export const ACCEPTED_MAX_PRESSURE_DBAR = 11_000;

/**
 * Latitude band |φ| below which the rotating plume model is not used and the radial-jet
 * fallback is reported instead, and the plume turns to neither side [degrees].
 * (c) common practice: product.md §4.3 ("a few degrees"); f at 2.5° is 6.4e-6 s⁻¹, which
 * makes the rotating widths hundreds of km — no longer a coastal current.
 */
export const EQUATORIAL_CUTOFF_DEGREES = 2.5;

/**
 * Latitude below which 1/f scalings are flagged as unreliable though still computed [degrees].
 * (c) common practice: science.md §1.9 ("unusable within roughly ±5–10° latitude").
 */
export const LOW_LATITUDE_WARNING_DEGREES = 10;

/**
 * Mean-speed prefactor of the zero-PV coastal current: U0 = C (f g′ Q)^{1/4},
 * C = (3/2)(1/32)^{1/4} ≈ 0.6307 [–].
 * (c) derived: science.md §1.4 family 1 (mean velocity Q/A with A = (2/3) H0 W0).
 */
export const ZERO_PV_MEAN_SPEED_COEFFICIENT = 1.5 * (1 / 32) ** 0.25;

/**
 * Default share of the river discharge carried on into the coastal current, F_cc [–].
 * (b) from memory: Fong & Geyer 2002; Horner-Devine et al. 2006 ("roughly one third to two
 * thirds"); default 0.6 is the (c) suggestion of science.md §1.6.
 */
export const DEFAULT_ALONGSHORE_SHARE = 0.6;
/** Smallest allowed alongshore share F_cc [–]. (c) common practice: science.md §1.6 (0.3 ≤ F_cc ≤ 1). */
export const MIN_ALONGSHORE_SHARE = 0.3;
/** Largest allowed alongshore share F_cc [–]. (c) common practice: science.md §1.6 (0.3 ≤ F_cc ≤ 1). */
export const MAX_ALONGSHORE_SHARE = 1;

/**
 * Density difference below which the plume is flagged as very weakly buoyant [kg m⁻³].
 * (c) common practice: with Δρ < 1 kg m⁻³ wind and tidal mixing dominate the buoyancy.
 */
export const WEAK_DENSITY_DIFFERENCE = 1;

/**
 * Discharge below which the river is flagged as too small for the scalings [m³ s⁻¹].
 * (c) common practice: at Q = 1 m³ s⁻¹ the current is a few centimetres thick.
 */
export const TINY_DISCHARGE = 1;

/**
 * Upper end of the laboratory range of c_w/c_α in Lentz & Helfrich (2002) [–].
 * (a) published: Lentz & Helfrich 2002, J. Fluid Mech. 464 (abstract), science.md §1.5 (0.11–13.1).
 */
export const LENTZ_HELFRICH_MAX_SPEED_RATIO = 13.1;

/**
 * Critical bulk Richardson number for wind mixing of a plume, Ri_c [–].
 * (a) published: Hetland, Coastal Dynamics book draft, "River plumes" (Ri_c ≈ 0.6), science.md §1.8.
 */
export const CRITICAL_RICHARDSON_NUMBER = 0.6;

/**
 * Froude number of the front of a non-rotating buoyant gravity current, used by the
 * equatorial radial-jet fallback [–]. (c) common practice: critical flow at the front.
 */
export const RADIAL_FRONT_FROUDE_NUMBER = 1;

/**
 * Reference spreading time of the radial-jet fallback when no flood duration is given [s].
 * (c) common practice: one day.
 */
export const RADIAL_REFERENCE_TIME = 86_400;

/** Seconds in an hour [s h⁻¹]. (c) definition. */
export const SECONDS_PER_HOUR = 3600;
/** Seconds in a day [s d⁻¹]. (c) definition. */
export const SECONDS_PER_DAY = 86_400;

/** Natural logarithm of 10, the factor in k = ln10 / T90 [–]. (c) definition. */
export const LN10 = Math.LN10;

/**
 * Mancini (1978) dark die-off rate in fresh water at 20 °C [d⁻¹].
 * (b) from memory: Mancini 1978, J. Water Pollut. Control Fed. 50, 2477–2484; science.md §5.1.
 */
export const MANCINI_FRESH_RATE_PER_DAY = 0.8;
/**
 * Mancini (1978) increase of the dark die-off rate per percent seawater [d⁻¹ %⁻¹].
 * (b) from memory: Mancini 1978; science.md §5.1.
 */
export const MANCINI_SEAWATER_RATE_PER_DAY_PERCENT = 0.006;
/**
 * Mancini (1978) temperature factor θ in θ^(T−20) [–].
 * (b) from memory: Mancini 1978; science.md §5.1.
 */
export const MANCINI_TEMPERATURE_FACTOR = 1.07;

/**
 * Default entrainment coefficient E of the coastal current [–]: the entrainment velocity across
 * the plume's base as a share of its mean speed, w_e = E·U0. Sets the dilution length
 * L_e = (a/φ0)·H0/E (science.md §1.11).
 * (b) from memory: E of order 10⁻⁵ to 10⁻⁴ for strongly stratified flow (after Ellison & Turner
 * 1959, where E falls steeply with the Richardson number); 3×10⁻⁵ is science.md §1.11's check
 * value (L_e = 21.6 km for the §1.10 river), a screening default to be fitted by calibration.
 */
export const DEFAULT_ENTRAINMENT_COEFFICIENT = 3e-5;
/** Smallest entrainment coefficient a user may set [–]. (c) a tenth of the low end of science.md §1.11's 10⁻⁵…10⁻⁴. */
export const MIN_ENTRAINMENT_COEFFICIENT = 1e-6;
/** Largest entrainment coefficient a user may set [–]. (c) ten times the high end of science.md §1.11's 10⁻⁵…10⁻⁴. */
export const MAX_ENTRAINMENT_COEFFICIENT = 1e-3;
/**
 * Shape factor a = Q/(U0·W0·H0) of the zero-PV coastal current [–]: its cross-section is
 * (2/3)·H0·W0 (science.md §1.4, family 1), so a = 2/3.
 * (c) derived: science.md §1.4 and §1.11.
 */
export const ZERO_PV_SHAPE_FACTOR = 2 / 3;

/** Default daytime T90 of E. coli / FC in a turbid flood plume [h]. (c) common practice: science.md §5.2. */
export const DEFAULT_T90_DAY_HOURS = 6;
/** Default night-time T90 of E. coli / FC in a turbid flood plume [h]. (c) common practice: science.md §5.2. */
export const DEFAULT_T90_NIGHT_HOURS = 48;
/** Default fraction of the day in daylight [–]. (c) common practice: 12 h of 24 h. */
export const DEFAULT_DAYLIGHT_FRACTION = 0.5;
/**
 * Default E. coli concentration in flood water, mixed rural catchment [CFU or MPN per 100 mL].
 * (c) common practice: science.md §5.3 screening default 10⁴.
 */
export const DEFAULT_FLOOD_INDICATOR_CONCENTRATION = 1e4;
