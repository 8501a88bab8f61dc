import { interpolateCividis, interpolateRdBu, interpolateViridis } from 'd3-scale-chromatic';

/**
 * Colours of the audit's maps (FORMATS.md "Maps"): ColorBrewer RdBu (flagged colour-blind safe), centred on
 * zero, for the error, over-applied toward red and under-applied toward blue; cividis for rates and viridis
 * for speed (Nuñez et al. 2018, PLoS ONE 13(7)). No rainbow, no red–green.
 */

/** A colour stop: a value and its colour. */
export type Stop = [number, string];

const STEPS = 8;

/** The error ramp from −limit to +limit (%), white at zero; values beyond the limit take the end colours. */
export function errorStops(limitPct: number): Stop[] {
  return Array.from({ length: STEPS + 1 }, (_, i) => {
    const v = -limitPct + (2 * limitPct * i) / STEPS;
    return [v, interpolateRdBu(0.5 - (0.5 * v) / limitPct)];
  });
}

/** A sequential ramp from lo to hi. */
export function sequentialStops(lo: number, hi: number, ramp: 'cividis' | 'viridis'): Stop[] {
  const f = ramp === 'cividis' ? interpolateCividis : interpolateViridis;
  const span = hi > lo ? hi - lo : 1;
  return Array.from({ length: STEPS + 1 }, (_, i) => [lo + (span * i) / STEPS, f(i / STEPS)]);
}

/** The colour of a value on stops (linear between them, held at the ends), for legends and charts. */
export function colourAt(stops: Stop[], v: number): string {
  if (v <= stops[0][0]) return stops[0][1];
  for (let i = 1; i < stops.length; i++) if (v <= stops[i][0]) return stops[i][1];
  return stops[stops.length - 1][1];
}

/** Points with no value for the layer shown (no corrected rate without both speeds). */
export const NO_VALUE = '#b9b2a3';
