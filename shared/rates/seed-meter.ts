/**
 * The seed meter arithmetic of DOMAIN.md §4. Populations are seeds per square metre, row spacing in
 * metres, ground speed in metres per second; disc speed in revolutions per minute.
 */

/** Seeds each row unit drops per second: population × row spacing × ground speed (derived). */
export function seedsPerSecondPerRow(seedsPerM2: number, rowSpacingM: number, speedMps: number): number {
  return seedsPerM2 * rowSpacingM * speedMps;
}

/** Seed disc revolutions per minute: 60 × seeds per second ÷ holes per disc (derived). */
export function discRpm(seedsPerSecond: number, holesPerDisc: number): number {
  if (!(holesPerDisc > 0)) throw new RangeError('holesPerDisc must be positive');
  return (60 * seedsPerSecond) / holesPerDisc;
}

/** Disc speed needed for a population at a ground speed. */
export function discRpmFor(
  seedsPerM2: number,
  rowSpacingM: number,
  speedMps: number,
  holesPerDisc: number,
): number {
  return discRpm(seedsPerSecondPerRow(seedsPerM2, rowSpacingM, speedMps), holesPerDisc);
}

/**
 * The fastest ground speed (m/s) at which the disc still delivers the population: the speed at which it
 * reaches its top rpm (DOMAIN.md §4).
 */
export function fastestDeliverableSpeedMps(
  seedsPerM2: number,
  rowSpacingM: number,
  holesPerDisc: number,
  discRpmMax: number,
): number {
  const seedsPerSecondAtMax = (discRpmMax * holesPerDisc) / 60;
  return seedsPerSecondAtMax / (seedsPerM2 * rowSpacingM);
}

export type Deliverability = {
  /** Disc rpm at each checked ground speed, in the order given. */
  rpm: number[];
  deliverable: boolean;
  /** Speeds (m/s) at which the disc would turn outside its limits. */
  outside: { speedMps: number; rpm: number; limit: 'below-min' | 'above-max' }[];
  fastestSpeedMps: number;
};

/**
 * A zone rate is deliverable when its disc speed at every planned ground speed lies inside the drive's
 * limits (DOMAIN.md §4).
 */
export function checkDeliverable(
  seedsPerM2: number,
  planter: { rowSpacingM: number; holesPerDisc: number; discRpmMin: number; discRpmMax: number },
  speedsMps: number[],
): Deliverability {
  const rpm = speedsMps.map((v) => discRpmFor(seedsPerM2, planter.rowSpacingM, v, planter.holesPerDisc));
  const outside: Deliverability['outside'] = [];
  rpm.forEach((r, i) => {
    if (r > planter.discRpmMax) outside.push({ speedMps: speedsMps[i], rpm: r, limit: 'above-max' });
    else if (r < planter.discRpmMin) outside.push({ speedMps: speedsMps[i], rpm: r, limit: 'below-min' });
  });
  return {
    rpm,
    deliverable: outside.length === 0,
    outside,
    fastestSpeedMps: fastestDeliverableSpeedMps(
      seedsPerM2,
      planter.rowSpacingM,
      planter.holesPerDisc,
      planter.discRpmMax,
    ),
  };
}
