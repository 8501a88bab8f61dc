import {
  defaultQuantityUnit,
  QUANTITY_UNIT_DEFS,
  quantityFromSi,
  type RateKind,
} from '@shared/rates/rate-units';
import { M_PER_FT, type UnitSystem } from '@shared/units';
import { formatNumber } from '@/lib/format';

/** A length in feet or metres: feet whole from 10 ft up (to a tenth under), metres to a tenth. */
export function formatLength(m: number, system: UnitSystem) {
  if (system === 'metric') return `${formatNumber(m, 1)} m`;
  const ft = m / M_PER_FT;
  return `${formatNumber(ft, Math.abs(ft) < 10 ? 1 : 0)} ft`;
}

/** A duration in seconds, minutes or hours, whichever reads best. */
export function formatDuration(s: number) {
  if (s < 120) return `${formatNumber(s)} s`;
  if (s < 7200) return `${formatNumber(s / 60)} min`;
  return `${formatNumber(s / 3600, 1)} h`;
}

/** A quantity given in SI (seeds, kg, m³) in the product's unit for the reader: seeds, lb or kg, gal or L. */
export function formatQuantity(si: number, rateKind: RateKind, system: UnitSystem) {
  const unit = defaultQuantityUnit(rateKind, system);
  return `${formatNumber(quantityFromSi(si, unit))} ${QUANTITY_UNIT_DEFS[unit].label}`;
}

/**
 * Colours of the diagnostics' marks: Okabe & Ito's palette (2008, "Color Universal Design"), told apart
 * under every common colour-vision deficiency; each pair also differs in shape or lightness.
 */
export const MARK = {
  blue: '#0072B2',
  orange: '#E69F00',
  vermillion: '#D55E00',
  ink: '#1f2630',
  soft: '#4a5462',
} as const;
