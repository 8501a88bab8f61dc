import { useId } from 'react';
import {
  LOG_FIELD_LABELS,
  LOG_FIELD_UNITS,
  LOG_FIELDS,
  REQUIRED_LOG_FIELDS,
  ROW_VALUE_KINDS,
  type ColumnMapping,
  type LogField,
} from '@shared/schemas/as-applied.schema';
import { GROUND_SPEED_SOURCE_LABELS, type GROUND_SPEED_SOURCES } from '@shared/schemas/planter.schema';
import { Select, type SelectOption } from '@/components/ui/input';
import { unitWords, type MappingDraft } from './mapping-values';

export type MeteredOn = (typeof GROUND_SPEED_SOURCES)[number];
const METERED_ORDER: MeteredOn[] = ['wheel', 'radar', 'gnss'];

/** What each field of a log is for, in a few words beside its name. */
const FIELD_HINTS: Partial<Record<LogField, string>> = {
  time: 'When the point was logged',
  lon: 'Decimal degrees, WGS84',
  lat: 'Decimal degrees, WGS84',
  target: 'The rate the controller was asked for',
  applied: 'The rate the controller says it put down',
  speed: 'When the log has one speed only',
  wheelSpeed: 'The speed sensor on the machine',
  gnssSpeed: 'Speed from the positioning receiver',
  speedSource: 'Which speed the controller used, point by point',
  width: 'Width planting at that moment',
  workOn: '1 while planting, 0 when lifted',
};

const RequiredMark = () => (
  <span className="ml-0.5 text-clay-700" aria-hidden>
    *
  </span>
);

/** The first few values of one column in the sample rows, so the person sees what it holds. */
function firstValues(columns: string[], sample: string[][], column: string) {
  const i = columns.indexOf(column);
  if (i < 0) return '';
  return sample
    .slice(0, 3)
    .map((r) => r[i] ?? '')
    .join(' · ');
}

/**
 * Step two: which column of the file holds what, and in which unit; required fields marked; the file's
 * first rows under it; and the speed the controller metered on.
 */
export function MappingStep({
  columns,
  sample,
  draft,
  rows,
  problems,
  meteredOn,
  planterSource,
  onChange,
  onMeteredOn,
}: {
  columns: string[];
  sample: string[][];
  draft: MappingDraft;
  rows: ColumnMapping['rows'];
  problems: Record<string, string>;
  meteredOn: MeteredOn;
  planterSource: MeteredOn | null;
  onChange: (field: LogField, next: Partial<MappingDraft[LogField]>) => void;
  onMeteredOn: (v: MeteredOn) => void;
}) {
  const id = useId();
  const columnOptions = columns.map((c) => ({ value: c, label: c }));
  return (
    <div className="space-y-5">
      <div className="overflow-x-auto rounded-card border border-ink-line bg-paper-raised">
        <table className="w-full border-collapse text-sm" aria-label="Column mapping">
          <thead>
            <tr className="border-b border-ink-line bg-paper-sunk/60 text-xs text-ink-soft">
              {['What', 'Column in the file', 'Unit', 'First values'].map((h) => (
                <th key={h} scope="col" className="px-3 py-1.5 text-left font-medium">
                  {h}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {LOG_FIELDS.map((f) => {
              const required = REQUIRED_LOG_FIELDS.includes(f);
              const units = LOG_FIELD_UNITS[f];
              const choice = draft[f];
              return (
                <tr key={f} data-field={f} className="border-b border-ink-line/70 align-top last:border-b-0">
                  <th scope="row" className="px-3 py-2 text-left font-normal">
                    <span className="font-medium text-ink">
                      {LOG_FIELD_LABELS[f]}
                      {required ? <RequiredMark /> : null}
                    </span>
                    {FIELD_HINTS[f] ? (
                      <span className="block text-xs text-ink-soft">{FIELD_HINTS[f]}</span>
                    ) : null}
                  </th>
                  <td className="px-3 py-2">
                    <CellSelect
                      label={`Column for ${LOG_FIELD_LABELS[f].toLowerCase()}`}
                      required={required}
                      error={problems[f]}
                      value={choice.column}
                      placeholder={required ? 'Choose the column' : 'Not in this file'}
                      options={columnOptions}
                      onChange={(v) => onChange(f, { column: v })}
                    />
                  </td>
                  <td className="px-3 py-2">
                    {units ? (
                      <CellSelect
                        label={`Unit of ${LOG_FIELD_LABELS[f].toLowerCase()}`}
                        error={problems[`${f}.unit`]}
                        value={choice.unit}
                        disabled={!choice.column}
                        placeholder="Choose the unit"
                        options={units.map((u) => ({ value: u, label: unitWords(u) }))}
                        onChange={(v) => onChange(f, { unit: v })}
                      />
                    ) : (
                      <span className="block pt-2 text-xs text-ink-faint">no unit</span>
                    )}
                  </td>
                  <td className="max-w-60 truncate px-3 py-2 pt-3.5 font-mono text-xs text-ink-soft">
                    {choice.column ? firstValues(columns, sample, choice.column) : ''}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      <p className="text-xs text-ink-soft">
        <RequiredMark /> needed to audit the log.
        {rows.length
          ? ` Also read: ${rows.length} per-row ${rows.length === 1 ? 'column' : 'columns'} (${[
              ...new Set(rows.map((r) => r.kind)),
            ]
              .sort((a, b) => ROW_VALUE_KINDS.indexOf(a) - ROW_VALUE_KINDS.indexOf(b))
              .join(', ')}).`
          : ''}
      </p>

      <SampleRows columns={columns} sample={sample} />

      <fieldset className="max-w-3xl">
        <legend className="text-sm font-medium text-ink">What the controller metered on</legend>
        <p className="mt-0.5 text-xs text-ink-soft">
          The controller sets the seed rate from this speed. If it reads fast (a slipping wheel, say), the
          planter puts down more seed than the target while the log still shows the target; with GNSS speed in
          the log too, the audit works out what was really planted.
          {draft.speedSource.column
            ? ' The log has a column saying which speed was in use; this choice only fills its gaps.'
            : ''}
        </p>
        <div className="mt-2 flex flex-wrap gap-x-5 gap-y-1">
          {METERED_ORDER.map((v) => (
            <label key={v} className="inline-flex items-center gap-2 text-sm text-ink">
              <input
                type="radio"
                name={`${id}-metered`}
                value={v}
                checked={meteredOn === v}
                onChange={() => onMeteredOn(v)}
                className="size-4 accent-clay-600"
              />
              {GROUND_SPEED_SOURCE_LABELS[v]}
              {planterSource === v ? <span className="text-xs text-ink-faint">(the planter’s)</span> : null}
            </label>
          ))}
        </div>
        {problems.meteredOn ? (
          <p className="mt-1 text-xs font-medium text-danger">{problems.meteredOn}</p>
        ) : null}
      </fieldset>
    </div>
  );
}

/** A select in a table cell, named for assistive technology, with its error under it. */
function CellSelect({
  label,
  error,
  required,
  onChange,
  ...rest
}: {
  label: string;
  error?: string;
  required?: boolean;
  value: string;
  disabled?: boolean;
  placeholder: string;
  options: SelectOption[];
  onChange: (value: string) => void;
}) {
  const errorId = useId();
  return (
    <>
      <Select
        aria-label={label}
        aria-required={required || undefined}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? errorId : undefined}
        onChange={(e) => onChange(e.target.value)}
        {...rest}
      />
      {error ? (
        <p id={errorId} className="mt-1 text-xs font-medium text-danger">
          {error}
        </p>
      ) : null}
    </>
  );
}

/** The file's first rows as they are, so the person sees what each column holds. */
function SampleRows({ columns, sample }: { columns: string[]; sample: string[][] }) {
  if (sample.length === 0) return null;
  return (
    <div>
      <p className="mb-1 text-sm font-medium text-ink">The first rows of the file</p>
      <div className="max-h-56 overflow-auto rounded-card border border-ink-line bg-paper-raised">
        <table className="border-collapse font-mono text-xs" aria-label="First rows of the file">
          <thead>
            <tr className="sticky top-0 border-b border-ink-line bg-paper-sunk text-left text-ink-soft">
              {columns.map((c, i) => (
                <th key={`${c}-${i}`} scope="col" className="px-2 py-1 font-medium whitespace-nowrap">
                  {c}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {sample.map((r, ri) => (
              <tr key={ri} className="border-b border-ink-line/60 last:border-b-0">
                {columns.map((_, ci) => (
                  <td key={ci} className="px-2 py-0.5 whitespace-nowrap text-ink">
                    {r[ci] ?? ''}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}
