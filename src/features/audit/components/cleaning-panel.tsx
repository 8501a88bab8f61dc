import { useState } from 'react';
import { cleaningSettingsSchema, type CleaningSettings, type Log } from '@shared/schemas/as-applied.schema';
import { M_PER_FT, speedFromDisplay, speedToDisplay, speedUnitLabel, type UnitSystem } from '@shared/units';
import { ProblemList } from '@/components/form/problem-list';
import { Button } from '@/components/ui/button';
import { FormField } from '@/components/ui/form-field';
import { Checkbox, Input } from '@/components/ui/input';
import { Notice } from '@/components/ui/notice';
import { isApiError } from '@/lib/api-client';
import { formatNumber } from '@/lib/format';
import { useRecleanLog } from '../api/audit-actions';

type NumKey = Exclude<keyof CleaningSettings, 'clipToBoundary'>;

/** How each setting is shown and typed: a label, a unit, and the factor between SI and what is typed. */
function settingDefs(system: UnitSystem): {
  key: NumKey;
  label: string;
  unit: string;
  toShown: (v: number) => number;
  fromShown: (v: number) => number;
}[] {
  const speed = speedUnitLabel(system);
  const same = (v: number) => v;
  const pct = { toShown: (v: number) => v * 100, fromShown: (v: number) => v / 100 };
  const spd = {
    toShown: (v: number) => speedToDisplay(v, system),
    fromShown: (v: number) => speedFromDisplay(v, system),
  };
  return [
    { key: 'minSpeedMps', label: 'Slowest speed kept', unit: speed, ...spd },
    { key: 'maxSpeedMps', label: 'Fastest speed kept', unit: speed, ...spd },
    { key: 'maxAccelMps2', label: 'Largest speed change', unit: `${speed} per second`, ...spd },
    {
      key: 'trimPassStartS',
      label: 'Dropped after a pass starts',
      unit: 's',
      toShown: same,
      fromShown: same,
    },
    { key: 'trimPassEndS', label: 'Dropped before a pass ends', unit: 's', toShown: same, fromShown: same },
    {
      key: 'turnDegPerS',
      label: 'Turning faster than this is a turn',
      unit: '° per second',
      toShown: same,
      fromShown: same,
    },
    {
      key: 'passGapS',
      label: 'A gap longer than this splits passes',
      unit: 's',
      toShown: same,
      fromShown: same,
    },
    {
      key: 'afterTargetChangeS',
      label: 'Dropped after the target changes',
      unit: 's',
      toShown: same,
      fromShown: same,
    },
    { key: 'plausibleRatioMin', label: 'Lowest plausible applied', unit: '% of target', ...pct },
    { key: 'plausibleRatioMax', label: 'Highest plausible applied', unit: '% of target', ...pct },
    // The diagnostics ("Why it happened"): the alarm replay's two delays and the coverage raster's cell.
    {
      key: 'alarmDelayS',
      label: 'Alarm after out of the band for',
      unit: 's',
      toShown: same,
      fromShown: same,
    },
    {
      key: 'compareAlarmDelayS',
      label: 'Compared with an alarm after',
      unit: 's',
      toShown: same,
      fromShown: same,
    },
    {
      key: 'coverageCellM',
      label: 'Coverage map cell',
      unit: system === 'imperial' ? 'ft' : 'm',
      toShown: (v: number) => (system === 'imperial' ? v / M_PER_FT : v),
      fromShown: (v: number) => (system === 'imperial' ? v * M_PER_FT : v),
    },
  ];
}

const shownText = (v: number) => String(Number(v.toFixed(2)));

/**
 * What cleaning removed, step by step, with its setting; and, for those who may, a form to clean again with
 * other settings or another tolerance band (the import runs again and the audit is worked out anew). Read
 * only once the audit is signed off.
 */
export function CleaningPanel({
  log,
  bandFraction,
  system,
  canAdjust,
  frozen,
}: {
  log: Log;
  bandFraction: number;
  system: UnitSystem;
  canAdjust: boolean;
  frozen: boolean;
}) {
  const [open, setOpen] = useState(false);
  const report = log.cleaningReport ?? [];
  const removed = report.reduce((s, r) => s + r.removed, 0);
  return (
    <div className="space-y-3">
      <div className="overflow-x-auto rounded-card border border-ink-line bg-paper-raised">
        <table className="w-full border-collapse text-sm" aria-label="Cleaning">
          <thead>
            <tr className="border-b border-ink-line bg-paper-sunk/60 text-xs text-ink-soft">
              {['Step', 'Setting', 'Points removed'].map((h) => (
                <th
                  key={h}
                  scope="col"
                  className={`px-3 py-1.5 font-medium ${h === 'Points removed' ? 'text-right' : 'text-left'}`}
                >
                  {h}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {report.map((r) => (
              <tr key={r.step} className="border-b border-ink-line/70">
                <td className="px-3 py-1.5">{r.label}</td>
                <td className="px-3 py-1.5 text-ink-soft">{r.setting}</td>
                <td className="px-3 py-1.5 text-right font-mono tabular-nums">{formatNumber(r.removed)}</td>
              </tr>
            ))}
            <tr className="bg-paper-sunk/40 font-medium">
              <td className="px-3 py-1.5" colSpan={2}>
                {formatNumber(log.pointsRead ?? 0)} points read, {formatNumber(log.pointsKept ?? 0)} kept
              </td>
              <td className="px-3 py-1.5 text-right font-mono tabular-nums">{formatNumber(removed)}</td>
            </tr>
          </tbody>
        </table>
      </div>
      {frozen ? (
        <p className="text-sm text-ink-soft">The audit is signed off: its cleaning no longer changes.</p>
      ) : canAdjust ? (
        open ? (
          <CleaningForm
            log={log}
            bandFraction={bandFraction}
            system={system}
            onClose={() => setOpen(false)}
          />
        ) : (
          <Button className="print:hidden" onClick={() => setOpen(true)}>
            Adjust cleaning
          </Button>
        )
      ) : null}
    </div>
  );
}

function CleaningForm({
  log,
  bandFraction,
  system,
  onClose,
}: {
  log: Log;
  bandFraction: number;
  system: UnitSystem;
  onClose: () => void;
}) {
  const defs = settingDefs(system);
  const [text, setText] = useState<Record<string, string>>(() => ({
    ...Object.fromEntries(defs.map((d) => [d.key, shownText(d.toShown(log.cleaning[d.key]))])),
    band: shownText(bandFraction * 100),
  }));
  const [clip, setClip] = useState(log.cleaning.clipToBoundary);
  const [problems, setProblems] = useState<Record<string, string>>({});
  const reclean = useRecleanLog(log.id);

  const serverProblems: Record<string, string> = {};
  let rest = !!reclean.error;
  if (isApiError(reclean.error) && reclean.error.details.length) {
    rest = false;
    for (const d of reclean.error.details) {
      const key = d.path[0] === 'cleaning' ? String(d.path[1]) : d.path[0] === 'bandFraction' ? 'band' : '';
      if (key) serverProblems[key] = d.message;
      else rest = true;
    }
  }
  const shown = { ...problems, ...serverProblems };

  const submit = () => {
    const next: Record<string, string> = {};
    const values: Record<string, number> = {};
    for (const d of defs) {
      const v = Number(text[d.key].replace(',', '.'));
      if (text[d.key].trim() === '' || !Number.isFinite(v)) next[d.key] = 'Type a number';
      else values[d.key] = d.fromShown(v);
    }
    const band = Number(text.band.replace(',', '.'));
    if (!Number.isFinite(band) || band < 1 || band > 50) next.band = 'Type a band from 1 to 50 %';
    const parsed = cleaningSettingsSchema.safeParse({ ...values, clipToBoundary: clip });
    if (!parsed.success) {
      for (const issue of parsed.error.issues) {
        const key = String(issue.path[0]);
        const def = defs.find((d) => d.key === key);
        next[key] ??= def ? outOfRange(def) : issue.message;
      }
    }
    setProblems(next);
    if (Object.keys(next).length || !parsed.success) return;
    reclean.mutate({ logId: log.id, version: log.version, cleaning: parsed.data, bandFraction: band / 100 });
  };

  return (
    <form
      className="space-y-4 rounded-card border border-ink-line bg-paper-raised p-4 print:hidden"
      aria-label="Adjust cleaning"
      onSubmit={(e) => {
        e.preventDefault();
        submit();
      }}
    >
      <p className="text-sm text-ink-soft">
        The log is read again with these settings and the audit worked out anew; it takes as long as the first
        reading.
      </p>
      <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
        {defs.map((d) => (
          <FormField key={d.key} label={d.label} unit={d.unit} error={shown[d.key]}>
            <Input
              type="number"
              value={text[d.key]}
              onChange={(e) => setText({ ...text, [d.key]: e.target.value })}
            />
          </FormField>
        ))}
        <FormField label="Tolerance band" unit="± % of target" error={shown.band}>
          <Input
            type="number"
            value={text.band}
            onChange={(e) => setText({ ...text, band: e.target.value })}
          />
        </FormField>
        <div className="flex items-end pb-2">
          <Checkbox
            label="Drop points outside the field boundary"
            checked={clip}
            onChange={(e) => setClip(e.target.checked)}
          />
        </div>
      </div>
      {rest ? (
        <Notice tone="danger" title="Not cleaned again">
          <ProblemList error={reclean.error} />
        </Notice>
      ) : null}
      <div className="flex gap-2">
        <Button type="submit" variant="primary" busy={reclean.isPending}>
          Clean and audit again
        </Button>
        <Button onClick={onClose}>Cancel</Button>
      </div>
    </form>
  );
}

/** The range a setting may take, in what the person types (cleaningSettingsSchema's limits). */
function outOfRange(def: ReturnType<typeof settingDefs>[number]) {
  const { minValue: lo, maxValue: hi } = cleaningSettingsSchema.shape[def.key].unwrap();
  if (lo == null || hi == null) return 'Out of range';
  return `From ${formatNumber(def.toShown(lo), 1)} to ${formatNumber(def.toShown(hi), 1)} ${def.unit}`;
}
