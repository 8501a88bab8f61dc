import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { CROP_LABELS, type Crop } from '@shared/schemas/crops';
import { M_PER_MI, type UnitSystem } from '@shared/units';
import { EmptyState } from '@/components/ui/empty-state';
import { Facts } from '@/components/ui/facts';
import { QueryState } from '@/components/ui/query-state';
import { formatArea, formatDateTime, formatNumber } from '@/lib/format';
import { useLogbook, type Logbook, type LogbookEntry } from '../api/get-logbook';

type Sums = Logbook['total'];

const distance = (m: number, system: UnitSystem) =>
  system === 'imperial' ? `${formatNumber(m / M_PER_MI, 1)} mi` : `${formatNumber(m / 1000, 1)} km`;
const hours = (h: number) => `${formatNumber(h, 1)} h`;
const seeds = (q: number) => formatNumber(q);

const KIND_WORDS: Record<LogbookEntry['kind'], string> = {
  log: 'Log added',
  rerun: 'Log read again',
  deleted: 'Log deleted, taken off',
};

const cropWord = (crop: string) => CROP_LABELS[crop as Crop] ?? crop;

/** The four sums in a row of cells, as a table's cells. */
function SumCells({ s, system }: { s: Sums; system: UnitSystem }) {
  return (
    <>
      {[formatArea(s.areaM2, system), seeds(s.quantity), distance(s.distanceM, system), hours(s.hours)].map(
        (v, i) => (
          <td key={i} className="px-3 py-1.5 text-right font-mono whitespace-nowrap tabular-nums">
            {v}
          </td>
        ),
      )}
    </>
  );
}

const SUM_HEADS = ['Area', 'Seeds', 'Distance', 'Hours'];

const ROW = 'border-b border-ink-line/70 last:border-b-0';

/** A table of the ledger: the given leading columns, then the four sums. */
function LedgerTable({ label, first, children }: { label: string; first: string[]; children: ReactNode }) {
  return (
    <div className="overflow-x-auto rounded-card border border-ink-line bg-paper-raised">
      <table className="w-full border-collapse text-sm" aria-label={label}>
        <Head first={first} />
        <tbody>{children}</tbody>
      </table>
    </div>
  );
}

function Head({ first }: { first: string[] }) {
  return (
    <thead>
      <tr className="border-b border-ink-line bg-paper-sunk/60 text-xs text-ink-soft">
        {first.map((h) => (
          <th key={h} scope="col" className="px-3 py-1.5 text-left font-medium">
            {h}
          </th>
        ))}
        {SUM_HEADS.map((h) => (
          <th key={h} scope="col" className="px-3 py-1.5 text-right font-medium">
            {h}
          </th>
        ))}
      </tr>
    </thead>
  );
}

function LogbookBody({ book, system }: { book: Logbook; system: UnitSystem }) {
  if (book.entries.length === 0)
    return (
      <EmptyState title="Nothing planted with this planter yet">
        Its counters start with the first log read for it.
      </EmptyState>
    );
  const deleted = new Set(book.entries.filter((e) => e.kind === 'deleted').map((e) => e.logId));
  return (
    <div className="space-y-4">
      <Facts
        columns={4}
        items={[
          { label: 'Planted, all seasons', value: formatArea(book.total.areaM2, system), numeric: true },
          { label: 'Seeds put down', value: seeds(book.total.quantity), numeric: true },
          { label: 'Distance planting', value: distance(book.total.distanceM, system), numeric: true },
          { label: 'Hours planting', value: hours(book.total.hours), numeric: true },
        ]}
      />
      <LedgerTable label="Logbook by season" first={['Season']}>
        {book.seasons.map((s) => (
          <tr key={s.year} className={ROW}>
            <th scope="row" className="px-3 py-1.5 text-left font-normal">
              {s.year}
            </th>
            <SumCells s={s} system={system} />
          </tr>
        ))}
      </LedgerTable>
      <LedgerTable label="Logbook entries" first={['When', 'Season', 'What', 'Note']}>
        {[...book.entries].reverse().map((e) => (
          <tr
            key={e.id}
            data-kind={e.kind}
            className={`${ROW} ${e.kind === 'deleted' ? 'text-ink-soft' : ''}`}
          >
            <td className="px-3 py-1.5 whitespace-nowrap">{formatDateTime(e.createdAt)}</td>
            <td className="px-3 py-1.5 whitespace-nowrap">
              {e.year} {cropWord(e.crop)}
            </td>
            <td className="px-3 py-1.5 whitespace-nowrap">{KIND_WORDS[e.kind]}</td>
            <td className="px-3 py-1.5">
              {e.kind !== 'deleted' && !deleted.has(e.logId) ? (
                <Link
                  to={`/logs/${e.logId}/audit`}
                  className="underline-offset-2 hover:text-clay-700 hover:underline"
                >
                  {e.note}
                </Link>
              ) : (
                e.note
              )}
            </td>
            <SumCells s={e} system={system} />
          </tr>
        ))}
      </LedgerTable>
    </div>
  );
}

/**
 * A planter's logbook: lifetime totals, a line per season and every entry with its note. The server sums it
 * from the logs read for the planter; no one types or edits a counter.
 */
export function PlanterLogbook({ planterId, system }: { planterId: string; system: UnitSystem }) {
  const query = useLogbook(planterId);
  return (
    <div className="space-y-3">
      <p className="max-w-3xl text-sm text-ink-soft">
        Counted from the logs read for this planter, and only from them: they cannot be edited. A log read
        again with other settings adds the difference; a deleted log is taken off with a line of its own.
      </p>
      <QueryState query={query}>{(book) => <LogbookBody book={book} system={system} />}</QueryState>
    </div>
  );
}
