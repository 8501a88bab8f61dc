import { countSections, minRowsPerSection } from '@shared/rates/count-sections';

const whole = (n: number) => Number.isInteger(n) && n >= 1;

/**
 * The live sum under the section inputs: "24 rows ÷ 2 per section = 12 sections (display controls 16)",
 * turning into a warning when the display cannot switch that many sections.
 */
export function SectionLine({
  rows,
  perSection,
  limit,
}: {
  rows: number;
  perSection: number;
  limit: number;
}) {
  if (!whole(rows) || !whole(perSection)) {
    return (
      <p className="text-sm text-ink-faint">Enter the rows and rows per section to see the section count.</p>
    );
  }
  if (perSection > rows) {
    return (
      <p role="status" className="text-sm font-medium text-caution">
        {perSection} rows per section is more than the planter's {rows} rows.
      </p>
    );
  }
  const sections = countSections(rows, perSection);
  const sum = `${rows} rows ÷ ${perSection} per section = ${sections} ${sections === 1 ? 'section' : 'sections'}`;
  if (!whole(limit))
    return (
      <p role="status" className="font-mono text-sm text-ink-soft">
        {sum}
      </p>
    );
  const over = sections > limit;
  return (
    <p
      role="status"
      className={`rounded-card border px-2.5 py-1.5 text-sm ${over ? 'border-caution/40 bg-caution-soft text-caution' : 'border-ink-line bg-paper text-ink-soft'}`}
    >
      <span className="font-mono">
        {sum} (display controls {limit})
      </span>
      {over ? (
        <span className="mt-0.5 block font-medium">
          More sections than the display can switch: use at least {minRowsPerSection(rows, limit)} rows per
          section.
        </span>
      ) : null}
    </p>
  );
}
