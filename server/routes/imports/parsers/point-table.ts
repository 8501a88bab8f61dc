import type { PointColumns } from './types';

/** Texts that mean "no value" in a numeric column (common practice in field data exports). */
const MISSING = new Set(['', 'na', 'n/a', 'nan', 'null', 'none', '-', '*']);

/**
 * Builds point columns one point at a time: x, y, and for each property its numbers (NaN where missing)
 * and how many values were text that is not a number.
 */
export class PointTable {
  private x: number[] = [];
  private y: number[] = [];
  private cols = new Map<string, { values: number[]; texts: number }>();

  get length() {
    return this.x.length;
  }

  add(x: number, y: number, props: Record<string, unknown>) {
    const i = this.x.length;
    this.x.push(x);
    this.y.push(y);
    for (const [name, raw] of Object.entries(props)) {
      const v = toNumber(raw);
      let col = this.cols.get(name);
      if (!col) {
        col = { values: new Array<number>(i).fill(Number.NaN), texts: 0 };
        this.cols.set(name, col);
      }
      while (col.values.length < i) col.values.push(Number.NaN);
      if (v === 'text') col.texts++;
      col.values.push(typeof v === 'number' ? v : Number.NaN);
    }
  }

  toColumns(): PointColumns {
    const n = this.x.length;
    const columns = [...this.cols].map(([name, c]) => {
      const values = new Float64Array(n).fill(Number.NaN);
      values.set(c.values.slice(0, n));
      return { name, values, texts: c.texts };
    });
    return { x: Float64Array.from(this.x), y: Float64Array.from(this.y), columns };
  }
}

/** A finite number, null for a missing value, or 'text' for anything else. */
export function toNumber(raw: unknown): number | null | 'text' {
  if (typeof raw === 'number') return Number.isFinite(raw) ? raw : null;
  if (raw === null || raw === undefined) return null;
  if (typeof raw !== 'string') return 'text';
  const s = raw.trim();
  if (MISSING.has(s.toLowerCase())) return null;
  const v = Number(s);
  return Number.isFinite(v) && /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(s) ? v : 'text';
}

/** Numeric columns: at least one number and no text that is not a number. */
export function numericSummary(columns: PointColumns['columns']) {
  const out: { name: string; min: number; max: number; count: number }[] = [];
  for (const c of columns) {
    if (c.texts > 0) continue;
    let min = Infinity;
    let max = -Infinity;
    let count = 0;
    for (const v of c.values) {
      if (Number.isNaN(v)) continue;
      count++;
      if (v < min) min = v;
      if (v > max) max = v;
    }
    if (count > 0) out.push({ name: c.name, min, max, count });
  }
  return out;
}
