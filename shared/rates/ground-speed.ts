/**
 * Ground speed and the population it causes (DOMAIN.md §5).
 */

/** Travel reduction (slip): s = 1 − v_true / v_wheel (ASABE S296, from memory). */
export function slip(vTrueMps: number, vWheelMps: number): number {
  if (!(vWheelMps > 0)) throw new RangeError('wheel speed must be positive');
  return 1 - vTrueMps / vWheelMps;
}

/**
 * A controller meters for the speed it is told: applied = target × v_reported / v_true (derived). With a
 * slipping wheel v_reported / v_true = 1 / (1 − s), so 10 % slip is +11.1 %, not +10 %.
 */
export function appliedPopulation(target: number, vReportedMps: number, vTrueMps: number): number {
  if (!(vTrueMps > 0)) throw new RangeError('true speed must be positive');
  return (target * vReportedMps) / vTrueMps;
}

/** Applied population when the controller metered on a wheel slipping by `s` (0 ≤ s < 1). */
export function appliedWithSlip(target: number, s: number): number {
  if (!(s >= 0 && s < 1)) throw new RangeError('slip must lie in [0, 1)');
  return target / (1 - s);
}

/** The true population behind a logged rate: logged × v_wheel / v_gnss (DOMAIN.md §5). */
export function truePopulation(loggedRate: number, vWheelMps: number, vGnssMps: number): number {
  return appliedPopulation(loggedRate, vWheelMps, vGnssMps);
}
