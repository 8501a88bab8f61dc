import { interpolateCividis } from 'd3-scale-chromatic';

/**
 * The one sequential ramp for zones and rates: cividis, designed to read the same for people with a
 * colour-vision deficiency and to rise evenly in lightness (Nuñez et al. 2018, PLoS ONE 13(7)).
 */
export const rampColour = (t: number) => interpolateCividis(Math.max(0, Math.min(1, t)));

/** `n` ramp colours from dark (lowest) to light (highest), evenly spaced. */
export const rampColours = (n: number) =>
  Array.from({ length: n }, (_, i) => rampColour(n === 1 ? 0.5 : i / (n - 1)));

/** Areas with no class or index (a default zone, the rest of the field). */
export const NO_VALUE_COLOUR = '#d3ccbb';
