// Invented log rows for the two-thread and piece-by-piece reading tests: six columns, values that vary by row.

export const HEADER = 'time (s),lon,lat,target (seeds/ac),applied (seeds/ac),gnss speed (mph)\n';

export const row = (i: number) =>
  `${1_800_000_000 + i * 0.2},${(-93.6 + i * 1e-6).toFixed(7)},${(42 + (i % 97) * 1e-6).toFixed(7)},${32000 + (i % 7) * 250},${31800 + (i % 11) * 50},${(5 + (i % 5) * 0.1).toFixed(1)}\n`;

/** CSV text of n rows; `edit(i, line)` may change row i's line. */
export function csv(n: number, edit: (i: number, line: string) => string = (_, l) => l) {
  let text = HEADER;
  for (let i = 0; i < n; i++) text += edit(i, row(i));
  return text;
}
