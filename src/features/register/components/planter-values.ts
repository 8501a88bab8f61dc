import type { Crop } from '@shared/schemas/crops';
import type { Planter, planterInputSchema } from '@shared/schemas/planter.schema';
import {
  lengthUnitLabel,
  rowSpacingFromDisplay,
  rowSpacingToDisplay,
  roundTo,
  speedFromDisplay,
  speedToDisplay,
  speedUnitLabel,
  type UnitSystem,
} from '@shared/units';
import type { z } from 'zod';

/**
 * The planter form holds row spacing and speeds in the user's units (in or cm; mph or km/h) under the
 * API's own keys, so an error the server reports for `rowSpacingM` lands beside that input. They are
 * converted to SI only when validated and sent.
 */
export type PlanterFormValues = {
  growerId: string;
  name: string;
  rowCount: number;
  rowSpacingM: number;
  arrangement: 'single' | 'split-row';
  interplantRowCount: number | null;
  rowsPerSection: number;
  displaySectionLimit: number;
  holesPerDisc: { crop: Crop | ''; holes: number }[];
  discRpmMin: number;
  discRpmMax: number;
  speedMinMps: number;
  speedPlannedMps: number;
  speedMaxMps: number;
  groundSpeedSource: Planter['groundSpeedSource'] | '';
  notes: string;
  version?: number;
};

export type PlanterSi = z.input<typeof planterInputSchema>;

export const SPEED_KEYS = ['speedMinMps', 'speedPlannedMps', 'speedMaxMps'] as const;
type UnitKey = 'rowSpacingM' | (typeof SPEED_KEYS)[number];

const toDisplay = (key: UnitKey, si: number, system: UnitSystem) =>
  key === 'rowSpacingM'
    ? roundTo(rowSpacingToDisplay(si, system), 2)
    : roundTo(speedToDisplay(si, system), 2);
const fromDisplay = (key: UnitKey, v: number, system: UnitSystem) =>
  key === 'rowSpacingM' ? rowSpacingFromDisplay(v, system) : speedFromDisplay(v, system);

/** Form values from a saved planter (or blank ones for a new planter), in the user's units. */
export function planterToForm(p: Planter | undefined, system: UnitSystem, growerId = ''): PlanterFormValues {
  if (!p) {
    return {
      growerId,
      name: '',
      rowCount: Number.NaN,
      rowSpacingM: Number.NaN,
      arrangement: 'single',
      interplantRowCount: null,
      rowsPerSection: 1,
      displaySectionLimit: Number.NaN,
      holesPerDisc: [{ crop: '', holes: Number.NaN }],
      discRpmMin: Number.NaN,
      discRpmMax: Number.NaN,
      speedMinMps: Number.NaN,
      speedPlannedMps: Number.NaN,
      speedMaxMps: Number.NaN,
      groundSpeedSource: '',
      notes: '',
    };
  }
  return {
    growerId: p.growerId,
    name: p.name,
    rowCount: p.rowCount,
    rowSpacingM: toDisplay('rowSpacingM', p.rowSpacingM, system),
    arrangement: p.arrangement,
    interplantRowCount: p.interplantRowCount,
    rowsPerSection: p.rowsPerSection,
    displaySectionLimit: p.displaySectionLimit,
    holesPerDisc: p.holesPerDisc.map((h) => ({ ...h })),
    discRpmMin: p.discRpmMin,
    discRpmMax: p.discRpmMax,
    speedMinMps: toDisplay('speedMinMps', p.speedMinMps, system),
    speedPlannedMps: toDisplay('speedPlannedMps', p.speedPlannedMps, system),
    speedMaxMps: toDisplay('speedMaxMps', p.speedMaxMps, system),
    groundSpeedSource: p.groundSpeedSource,
    notes: p.notes ?? '',
    version: p.version,
  };
}

/**
 * Form values to the API's SI shape. A unit value the user left as shown keeps the saved SI value exactly,
 * so saving a planter in other units does not creep by rounding.
 */
export function formToSi(v: PlanterFormValues, system: UnitSystem, saved?: Planter): PlanterSi {
  const si = (key: UnitKey) =>
    saved && v[key] === toDisplay(key, saved[key], system) ? saved[key] : fromDisplay(key, v[key], system);
  return {
    growerId: v.growerId,
    name: v.name,
    rowCount: v.rowCount,
    rowSpacingM: si('rowSpacingM'),
    arrangement: v.arrangement,
    interplantRowCount: v.arrangement === 'split-row' ? v.interplantRowCount : null,
    rowsPerSection: v.rowsPerSection,
    displaySectionLimit: v.displaySectionLimit,
    holesPerDisc: v.holesPerDisc as PlanterSi['holesPerDisc'],
    discRpmMin: v.discRpmMin,
    discRpmMax: v.discRpmMax,
    speedMinMps: si('speedMinMps'),
    speedPlannedMps: si('speedPlannedMps'),
    speedMaxMps: si('speedMaxMps'),
    groundSpeedSource: v.groundSpeedSource as PlanterSi['groundSpeedSource'],
    notes: v.notes,
  };
}

/**
 * Rewrites a limit stated in SI ("… at least 0.1 m", "… at most 10 m/s") into the user's units, for the
 * inputs that take in/cm or mph/km/h. Other messages pass through.
 */
export function messageInUserUnits(key: string, message: string, system: UnitSystem): string {
  const isSpeed = (SPEED_KEYS as readonly string[]).includes(key);
  if (key !== 'rowSpacingM' && !isSpeed) return message;
  return message.replace(
    /(at (?:least|most)) (\d+(?:\.\d+)?) (m\/s|m)\b/,
    (_all, words: string, n: string) => {
      const shown = toDisplay(isSpeed ? 'speedMinMps' : 'rowSpacingM', Number(n), system);
      return `${words} ${roundTo(shown, 1)} ${isSpeed ? speedUnitLabel(system) : lengthUnitLabel(system)}`;
    },
  );
}
