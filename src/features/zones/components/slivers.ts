/**
 * Gaps and overlaps smaller than this (m²) are left out of the page: slivers of a few square metres along
 * cut lines, from positions rounded to 7 decimals (about 1 cm), are not worth a warning.
 */
export const SLIVER_M2 = 20;
