import {
  columnMappingSchema,
  LOG_FIELD_UNITS,
  LOG_FIELDS,
  type ColumnMapping,
  type LogField,
} from '@shared/schemas/as-applied.schema';
import { RATE_UNIT_DEFS, type RateUnit } from '@shared/rates/rate-units';

/** What the person chose for one field: a column of the file ('' for none) and its unit ('' for none). */
export type FieldChoice = { column: string; unit: string };
export type MappingDraft = Record<LogField, FieldChoice>;

const OTHER_UNIT_WORDS: Record<string, string> = {
  iso: 'Date and time (ISO 8601)',
  'epoch-s': 'Seconds since 1 Jan 1970 (UTC)',
  'epoch-ms': 'Milliseconds since 1 Jan 1970 (UTC)',
  mph: 'mph',
  'km/h': 'km/h',
  'm/s': 'm/s',
  ft: 'feet',
  in: 'inches',
  m: 'metres',
  deg: 'degrees from north',
  count: 'a count',
  'of-total': 'share of all (0 to 1)',
};

/** A unit code of LOG_FIELD_UNITS in words. */
export const unitWords = (unit: string) =>
  unit in RATE_UNIT_DEFS ? RATE_UNIT_DEFS[unit as RateUnit].title : (OTHER_UNIT_WORDS[unit] ?? unit);

/**
 * The first choice of each field: the mapping last used with this planter where its column is in this
 * file, else the one suggested from the header.
 */
export function initialDraft(
  columns: string[],
  suggested: ColumnMapping,
  remembered: ColumnMapping | null,
): MappingDraft {
  const have = new Set(columns);
  const out = {} as MappingDraft;
  for (const f of LOG_FIELDS) {
    const mine = remembered?.fields[f];
    const spec = mine && have.has(mine.column) ? mine : suggested.fields[f];
    const units = LOG_FIELD_UNITS[f];
    out[f] = {
      column: spec && have.has(spec.column) ? spec.column : '',
      unit: spec?.unit && units?.includes(spec.unit) ? spec.unit : '',
    };
  }
  return out;
}

/** Per-row columns to keep from the remembered or suggested mapping (only those in this file). */
export function initialRows(columns: string[], suggested: ColumnMapping, remembered: ColumnMapping | null) {
  const have = new Set(columns);
  const rows = remembered?.rows.filter((r) => have.has(r.column)) ?? [];
  return rows.length ? rows : suggested.rows.filter((r) => have.has(r.column));
}

/** The mapping as the API takes it, and what is wrong with it, keyed 'time' or 'time.unit'. */
export function mappingOf(draft: MappingDraft, rows: ColumnMapping['rows']) {
  const fields: ColumnMapping['fields'] = {};
  for (const f of LOG_FIELDS) {
    const c = draft[f];
    if (c.column) fields[f] = { column: c.column, unit: LOG_FIELD_UNITS[f] ? c.unit || null : null };
  }
  const parsed = columnMappingSchema.safeParse({ fields, rows });
  const problems: Record<string, string> = {};
  if (!parsed.success) {
    for (const issue of parsed.error.issues) problems[problemKey(issue.path)] ??= issue.message;
  }
  return { mapping: { fields, rows }, problems };
}

/** ['fields','applied','unit'] (or with 'mapping' first, as the server sends it) → 'applied.unit'. */
export function problemKey(path: readonly PropertyKey[]): string {
  const parts = path.map(String);
  const from = parts[0] === 'mapping' ? 1 : 0;
  if (parts[from] === 'fields') return parts.slice(from + 1).join('.');
  return parts.slice(from).join('.');
}
