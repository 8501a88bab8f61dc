import type { Planter } from '../schemas/planter.schema';
import type { PlanterCheck, ZoneCheck } from '../schemas/prescription.schema';
import { CROP_LABELS, type Crop } from '../schemas/crops';
import { speedToDisplay, speedUnitLabel, type UnitSystem } from '../units';
import { countSections, minRowsPerSection } from './count-sections';
import { formatRate, type RateUnit } from './rate-units';
import { checkDeliverable, fastestDeliverableSpeedMps, seedsPerSecondPerRow } from './seed-meter';

/**
 * The planter check of a prescription (DOMAIN.md §4, DEVELOPERS.md "Prescriptions"): can the seed disc
 * deliver each zone's rate at the planter's low, planned and high ground speed, and can the display
 * control the planter's sections.
 */

export type CheckPlanter = Pick<
  Planter,
  | 'id'
  | 'name'
  | 'rowCount'
  | 'rowSpacingM'
  | 'rowsPerSection'
  | 'displaySectionLimit'
  | 'holesPerDisc'
  | 'discRpmMin'
  | 'discRpmMax'
  | 'speedMinMps'
  | 'speedPlannedMps'
  | 'speedMaxMps'
>;

export type CheckZone = { zoneId: string; name: string; rateSi: number };

export type CheckPlanterInput = {
  planter: CheckPlanter;
  crop: Crop;
  /** Zones with their SI rate (seeds/m²); include `{ zoneId: 'default' }` for the default rate. */
  zones: CheckZone[];
  /** How speeds read in the messages. */
  unitSystem: UnitSystem;
  /** How rates read in the messages. */
  rateUnit: RateUnit;
};

type Speeds = { low: number; planned: number; high: number };

const oneDecimal = (n: number) => n.toFixed(1);
/** A limit the person typed: as typed, at most one decimal ("45", "4.5"). */
const limitText = (n: number) => String(Math.round(n * 10) / 10);

function zoneCheck(
  zone: CheckZone,
  planter: CheckPlanter,
  holes: number | null,
  speeds: Speeds,
  input: Pick<CheckPlanterInput, 'unitSystem' | 'rateUnit'>,
): ZoneCheck {
  if (!Number.isFinite(zone.rateSi) || zone.rateSi < 0) {
    throw new RangeError(
      `The rate of zone ${zone.name} must be a number of at least 0, got ${String(zone.rateSi)}`,
    );
  }
  const seedsPerSecond = {
    low: seedsPerSecondPerRow(zone.rateSi, planter.rowSpacingM, speeds.low),
    planned: seedsPerSecondPerRow(zone.rateSi, planter.rowSpacingM, speeds.planned),
    high: seedsPerSecondPerRow(zone.rateSi, planter.rowSpacingM, speeds.high),
  };
  const base = {
    zoneId: zone.zoneId,
    name: zone.name,
    rateSi: zone.rateSi,
    seedsPerSecondPerRow: seedsPerSecond,
  };
  // No seed: the disc stands still and nothing can go wrong. No disc setting: nothing to compute.
  if (zone.rateSi === 0 || holes === null) {
    return {
      ...base,
      discRpm: { low: 0, planned: 0, high: 0 },
      slowestSpeedMps: 0,
      fastestSpeedMps: 0,
      status: zone.rateSi === 0 ? 'ok' : 'flagged',
      messages: [],
    };
  }
  const meter = { rowSpacingM: planter.rowSpacingM, holesPerDisc: holes };
  const d = checkDeliverable(
    zone.rateSi,
    { ...meter, discRpmMin: planter.discRpmMin, discRpmMax: planter.discRpmMax },
    [speeds.low, speeds.planned, speeds.high],
  );
  const slowestSpeedMps = fastestDeliverableSpeedMps(
    zone.rateSi,
    planter.rowSpacingM,
    holes,
    planter.discRpmMin,
  );
  const plannedOutside = d.outside.some((o) => o.speedMps === speeds.planned);
  const status = plannedOutside ? 'flagged' : d.outside.length > 0 ? 'warning' : 'ok';

  const speed = (mps: number) =>
    `${oneDecimal(speedToDisplay(mps, input.unitSystem))} ${speedUnitLabel(input.unitSystem)}`;
  const rate = formatRate(zone.rateSi, input.rateUnit);
  const messages: string[] = [];
  // Speeds run low → high, so the slowest speed that is too fast and the fastest that is too slow are the
  // ones nearest the window: name those.
  const tooFast = d.outside.filter((o) => o.limit === 'above-max');
  const tooSlow = d.outside.filter((o) => o.limit === 'below-min');
  if (tooFast.length > 0) {
    const o = tooFast.reduce((a, b) => (b.speedMps < a.speedMps ? b : a));
    messages.push(
      `At ${speed(o.speedMps)} the disc must turn ${oneDecimal(o.rpm)} rpm for ${rate}, above its top of ` +
        `${limitText(planter.discRpmMax)} rpm: this rate is deliverable up to ${speed(d.fastestSpeedMps)}.`,
    );
  }
  if (tooSlow.length > 0) {
    const o = tooSlow.reduce((a, b) => (b.speedMps > a.speedMps ? b : a));
    messages.push(
      `At ${speed(o.speedMps)} the disc would turn ${oneDecimal(o.rpm)} rpm for ${rate}, below its lowest of ` +
        `${limitText(planter.discRpmMin)} rpm: this rate needs at least ${speed(slowestSpeedMps)}.`,
    );
  }
  const [low, planned, high] = d.rpm;
  return {
    ...base,
    discRpm: { low, planned, high },
    slowestSpeedMps,
    fastestSpeedMps: d.fastestSpeedMps,
    status,
    messages,
  };
}

export function checkPlanter(input: CheckPlanterInput): PlanterCheck {
  const { planter, crop } = input;
  const holes = planter.holesPerDisc.find((h) => h.crop === crop)?.holes ?? null;
  const speeds: Speeds = {
    low: planter.speedMinMps,
    planned: planter.speedPlannedMps,
    high: planter.speedMaxMps,
  };
  const messages: string[] = [];
  if (holes === null) {
    messages.push(
      `Planter ${planter.name} has no seed disc set for ${CROP_LABELS[crop].toLowerCase()}: add holes per disc on the planter.`,
    );
  }
  const count = countSections(planter.rowCount, planter.rowsPerSection);
  const sectionsOk = count <= planter.displaySectionLimit;
  if (!sectionsOk) {
    const need = minRowsPerSection(planter.rowCount, planter.displaySectionLimit);
    messages.push(
      `Planter ${planter.name} has ${count} sections (${planter.rowCount} rows, ${planter.rowsPerSection} per section) ` +
        `but its display controls at most ${planter.displaySectionLimit}: set at least ${need} rows per section.`,
    );
  }
  const zones = input.zones.map((z) => zoneCheck(z, planter, holes, speeds, input));
  return {
    planterId: planter.id,
    planterName: planter.name,
    crop,
    holesPerDisc: holes,
    speedsMps: speeds,
    sections: {
      count,
      limit: planter.displaySectionLimit,
      rowsPerSection: planter.rowsPerSection,
      ok: sectionsOk,
    },
    zones,
    messages,
    blocking: holes === null || !sectionsOk || zones.some((z) => z.status === 'flagged'),
  };
}
