import type { PreviewFeature } from '@shared/schemas/import.schema';
import { areaToDisplay, areaUnitLabel, type UnitSystem } from '@shared/units';
import { formatNumber } from '@/lib/format';

const NAME_KEYS = ['name', 'Name', 'NAME', 'label', 'Label', 'zone', 'Zone', 'ZONE', 'id', 'ID', 'Id'];

/** What to call a feature of a file: its name-like property if it has one, else its number. */
export function featureLabel(f: PreviewFeature): string {
  const key = NAME_KEYS.find((k) => f.properties[k] != null && String(f.properties[k]).trim() !== '');
  const n = `Feature ${f.index + 1}`;
  return key ? `${n}: ${String(f.properties[key])}` : n;
}

/** PostGIS's reason without the position it appends ("Self-intersection[-93.6 42.01]" → "Self-intersection"). */
export const reasonWords = (reason: string | null) =>
  (reason ?? 'Not a valid polygon').replace(/\s*\[[^\]]*\]\s*$/, '');

/** A place as degrees with hemispheres, 6 decimals (about 10 cm). */
export const placeWords = ([lon, lat]: number[]) =>
  `${Math.abs(lat).toFixed(6)}° ${lat >= 0 ? 'N' : 'S'}, ${Math.abs(lon).toFixed(6)}° ${lon >= 0 ? 'E' : 'W'}`;

/** A signed change of area, "−0.42 ac" or "+0.03 ha" (two decimals, a true minus sign). */
export function areaChangeWords(deltaM2: number, system: UnitSystem) {
  const v = areaToDisplay(deltaM2, system);
  const rounded = Math.abs(v) < 0.005 ? 0 : v;
  const sign = rounded > 0 ? '+' : rounded < 0 ? '\u2212' : '±';
  return `${sign}${formatNumber(Math.abs(rounded), 2)} ${areaUnitLabel(system)}`;
}
