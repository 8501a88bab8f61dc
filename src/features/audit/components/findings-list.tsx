import type { Finding } from '@shared/schemas/as-applied.schema';

const SEVERITY: Record<Finding['severity'], { word: string; bar: string; box: string; rank: number }> = {
  problem: { word: 'Problem', bar: 'bg-danger', box: 'border-danger/40 bg-danger-soft', rank: 0 },
  notice: { word: 'Worth a look', bar: 'bg-caution', box: 'border-caution/40 bg-caution-soft', rank: 1 },
  info: { word: 'Note', bar: 'bg-slate-700', box: 'border-ink-line bg-paper-raised', rank: 2 },
};

/** What the audit found, in plain sentences, the problems first; the word says the severity, the colour repeats it. */
export function FindingsList({ findings }: { findings: Finding[] }) {
  if (findings.length === 0)
    return <p className="text-sm text-ink-soft">Nothing stands out: the log follows the prescription.</p>;
  const sorted = [...findings].sort((a, b) => SEVERITY[a.severity].rank - SEVERITY[b.severity].rank);
  return (
    <ul aria-label="Findings" className="space-y-2">
      {sorted.map((f, i) => {
        const s = SEVERITY[f.severity];
        return (
          <li
            key={`${f.kind}-${i}`}
            data-severity={f.severity}
            className={`relative flex flex-wrap items-baseline gap-x-3 gap-y-0.5 overflow-hidden rounded-card border py-2 pr-3 pl-4 text-base ${s.box}`}
          >
            <span className={`absolute inset-y-0 left-0 w-1 ${s.bar}`} aria-hidden />
            <span className="w-24 shrink-0 text-xs font-medium tracking-wide text-ink-soft uppercase">
              {s.word}
            </span>
            <span className="min-w-0 flex-1 text-ink">{f.text}</span>
          </li>
        );
      })}
    </ul>
  );
}
