// Physical and astronomical constants, SI units. Each carries its source.

/** Newtonian constant of gravitation, m³ kg⁻¹ s⁻² (CODATA 2018 recommended value). */
export const G = 6.6743e-11;

/** Speed of light in vacuum, m/s (exact by the SI definition of the metre, 1983). */
export const C = 299_792_458;

/** Nominal solar mass parameter GM_sun, m³ s⁻² (IAU 2015 Resolution B3). */
export const GM_SUN = 1.3271244e20;

/** Solar mass in kg, derived as GM_sun / G (IAU 2015 B3 with CODATA 2018 G). */
export const M_SUN = GM_SUN / G;

/** Solar mass expressed as a time, G M_sun / c³, s (≈ 4.9255 µs). */
export const T_SUN = GM_SUN / (C * C * C);

/** Astronomical unit, m (exact, IAU 2012 Resolution B2). */
export const AU = 149_597_870_700;

/** Parsec, m: 648000/π au (exact by definition, IAU 2015 Resolution B2). */
export const PARSEC = (648_000 / Math.PI) * AU;

/** Megaparsec, m. */
export const MPC = 1e6 * PARSEC;

/** Julian year, s: 365.25 days of 86400 s (IAU definition). */
export const JULIAN_YEAR = 365.25 * 86_400;

/** Light year, m: the distance light travels in one Julian year (IAU). */
export const LIGHT_YEAR = C * JULIAN_YEAR;

/** Day, s. */
export const DAY = 86_400;

/** Nominal solar luminosity, W (IAU 2015 Resolution B3). */
export const L_SUN = 3.828e26;
