import { RATE_UNIT_DEFS } from '@shared/rates/rate-units';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { rateWords } from './rate-values';
import { BOUND_LABELS, changesOf, draftOf, type Conflict, type Draft } from './use-draft';

/**
 * Someone else saved the prescription while it was being changed here (a save answered 409 stale). What
 * was changed here stays typed; the notice lists each change beside what is saved now, and offers to keep
 * the changes over the saved version (the rest as saved) or to take the saved version as it is.
 */
export function ConflictNotice({
  mine,
  conflict: { opened, theirs },
  onKeepMine,
  onTakeTheirs,
}: {
  mine: Draft;
  conflict: Conflict;
  onKeepMine: () => void;
  onTakeTheirs: () => void;
}) {
  const saved = draftOf(theirs);
  const { fields, rates } = changesOf(mine, opened);
  const unit = mine.rateUnit;
  const show = (v: unknown, key: string) =>
    v === null || v === undefined
      ? '(empty)'
      : key === 'rateUnit'
        ? RATE_UNIT_DEFS[v as Draft['rateUnit']].label
        : typeof v === 'number'
          ? rateWords(v, unit)
          : String(v);
  const lines = [
    ...fields
      .filter((k) => mine[k] !== saved[k])
      .map((k) => ({
        key: k,
        label: k === 'name' ? 'Name' : k === 'rateUnit' ? 'Rate unit' : BOUND_LABELS[k],
        yours: show(mine[k], k),
        now: show(saved[k], k),
      })),
    ...rates
      .filter((id) => mine.rates[id] !== saved.rates[id])
      .map((id) => ({
        key: id,
        label: theirs.zones.find((z) => z.id === id)?.name ?? 'A zone',
        yours: show(mine.rates[id], 'rate'),
        now: show(saved.rates[id], 'rate'),
      })),
  ];
  return (
    <Notice tone="caution" title="Someone else saved this prescription while you were working">
      <p>
        Your changes are kept here and are not saved yet: keep them over the saved version and press Save, or
        use the saved version.{' '}
        {lines.length
          ? 'Where they differ from what is saved now:'
          : 'They do not differ from what is saved now.'}
      </p>
      {lines.length ? (
        <ul className="mt-1 list-disc pl-5 text-ink">
          {lines.map((l) => (
            <li key={l.key}>
              {l.label}: yours <span className="font-mono">{l.yours}</span>, saved now{' '}
              <span className="font-mono">{l.now}</span>
            </li>
          ))}
        </ul>
      ) : null}
      <div className="mt-2 flex flex-wrap gap-2">
        <Button size="sm" variant="primary" onClick={onKeepMine}>
          Keep my changes
        </Button>
        <Button size="sm" onClick={onTakeTheirs}>
          Use the saved version
        </Button>
      </div>
    </Notice>
  );
}
