/**
 * The rate rule (DEVELOPERS.md "Prescriptions"): a zone's rate follows its productivity index,
 * rate = clamp(round(base × PI / step) × step, min, max). A zone without an index gets the base rate,
 * rounded and clamped alike. Unit-agnostic: the numbers are in whatever unit the caller works in.
 */

export type RuleZone = { zoneId: string; productivityIndex: number | null };

export type RuleInput = {
  base: number;
  min: number;
  max: number;
  /** Rounding step; 0 or less means no rounding. */
  step: number;
  zones: RuleZone[];
};

export type RuleRate = {
  zoneId: string;
  /** The rate to use: rounded to the step, then held inside [min, max]. */
  rate: number;
  /** base × productivity index (or base), before rounding and clamping. */
  raw: number;
  /** Which bound held the rate back, if any. */
  clamped: 'min' | 'max' | null;
};

/** Takes the float noise out of a multiple of a step (0.1 × 3 = 0.30000000000000004). */
const tidy = (n: number) => Number(n.toPrecision(12));

function requireFinite(value: number, what: string) {
  if (!Number.isFinite(value)) throw new RangeError(`${what} must be a finite number, got ${String(value)}`);
}

export function ratesByRule({ base, min, max, step, zones }: RuleInput): RuleRate[] {
  requireFinite(base, 'The base rate');
  requireFinite(min, 'The lowest rate');
  requireFinite(max, 'The highest rate');
  requireFinite(step, 'The rounding step');
  if (min > max) throw new RangeError(`The lowest rate (${min}) is above the highest rate (${max})`);
  return zones.map(({ zoneId, productivityIndex }) => {
    if (productivityIndex !== null)
      requireFinite(productivityIndex, `The productivity index of zone ${zoneId}`);
    const raw = productivityIndex === null ? base : base * productivityIndex;
    const rounded = step > 0 ? tidy(Math.round(raw / step) * step) : raw;
    if (rounded < min) return { zoneId, rate: min, raw, clamped: 'min' as const };
    if (rounded > max) return { zoneId, rate: max, raw, clamped: 'max' as const };
    return { zoneId, rate: rounded, raw, clamped: null };
  });
}
