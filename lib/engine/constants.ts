/** Engine-wide physical and numerical constants. SI units throughout. */

/** Boltzmann constant k, J/K. Exact since the 2019 SI redefinition (BIPM SI Brochure, 9th ed.). */
export const BOLTZMANN = 1.380649e-23;

/** Elementary charge q, C. Exact since the 2019 SI redefinition (BIPM SI Brochure, 9th ed.). */
export const ELEMENTARY_CHARGE = 1.602176634e-19;

export const TWO_PI = 2 * Math.PI;

/**
 * Headroom share below which a stage is called `tight`: under 10 % of its usable span to spare.
 * Common practice (a rule of thumb), not a standard.
 */
export const TIGHT_SHARE = 0.1;

/** Points per decade of the dense grids used for peaks, slew and alias searches (before refinement). */
export const PEAK_POINTS_PER_DECADE = 96;

/**
 * When the source band starts at DC (fLow = 0) the dense log grid starts this many decades below fHigh;
 * f = 0 itself is evaluated exactly from the DC limit.
 */
export const DC_BAND_DECADES = 9;

/** Relative tolerance of the adaptive noise integration (per path, on the total power). */
export const NOISE_REL_TOL = 1e-7;
