import { useState } from 'react';
import type { Prescription, UpdatePrescriptionBody } from '@shared/schemas/prescription.schema';
import type { RateUnit } from '@shared/rates/rate-units';
import { rateWords } from './rate-values';

export const BOUND_KEYS = ['defaultRateSi', 'outOfFieldRateSi', 'minRateSi', 'maxRateSi'] as const;
export type BoundKey = (typeof BOUND_KEYS)[number];
export const BOUND_LABELS: Record<BoundKey, string> = {
  defaultRateSi: 'Default rate',
  outOfFieldRateSi: 'Out-of-field rate',
  minRateSi: 'Lowest rate',
  maxRateSi: 'Highest rate',
};

/** What the editor changes before saving: SI rates (null while what is typed is not a rate). */
export type Draft = {
  name: string;
  rateUnit: RateUnit;
  rates: Record<string, number | null>;
} & Record<BoundKey, number | null>;

export const draftOf = (p: Prescription): Draft => ({
  name: p.name,
  rateUnit: p.rateUnit,
  defaultRateSi: p.defaultRateSi,
  outOfFieldRateSi: p.outOfFieldRateSi,
  minRateSi: p.minRateSi,
  maxRateSi: p.maxRateSi,
  rates: Object.fromEntries(p.zones.map((z) => [z.id, z.rateSi])),
});

const sameDraft = (a: Draft, b: Draft) => JSON.stringify(a) === JSON.stringify(b);

const SCALAR_KEYS = ['name', 'rateUnit', ...BOUND_KEYS] as const;

/** What was changed here since `from` was read: the draft's entries that differ from it. */
export function changesOf(draft: Draft, from: Draft) {
  const fields = SCALAR_KEYS.filter((k) => draft[k] !== from[k]);
  const rates = Object.keys(draft.rates).filter((id) => draft.rates[id] !== from.rates[id]);
  return { fields, rates };
}

/** The newer version with what was changed here laid over it. */
function overlay(theirs: Draft, draft: Draft, from: Draft): Draft {
  const { fields, rates } = changesOf(draft, from);
  const next: Draft = { ...theirs, rates: { ...theirs.rates } };
  for (const k of fields) (next as Record<string, unknown>)[k] = draft[k];
  for (const id of rates) if (id in next.rates) next.rates[id] = draft.rates[id];
  return next;
}

/** Problems with the draft as typed: by bound key, and by zone id. */
export type DraftProblems = {
  name?: string;
  bounds: Partial<Record<BoundKey, string>>;
  zones: Record<string, string>;
};

export function problemsOf(draft: Draft, p: Prescription): DraftProblems {
  const bounds: DraftProblems['bounds'] = {};
  const zones: DraftProblems['zones'] = {};
  for (const k of BOUND_KEYS) if (draft[k] === null) bounds[k] = `Type the ${BOUND_LABELS[k].toLowerCase()}`;
  const { minRateSi: min, maxRateSi: max, defaultRateSi: def } = draft;
  // The tolerance absorbs the conversion of a typed figure to SI and back.
  const eps = 1e-9;
  if (min !== null && max !== null && min > max + eps)
    bounds.maxRateSi = 'The highest rate cannot be below the lowest';
  const inRange = min !== null && max !== null && min <= max + eps;
  if (inRange && def !== null && (def < min - eps || def > max + eps))
    bounds.defaultRateSi = 'The default rate must lie between the lowest and highest rate';
  for (const z of p.zones) {
    const r = draft.rates[z.id];
    if (r === null || r === undefined) zones[z.id] = 'Type a rate of at least 0';
    else if (inRange && r < min - eps)
      zones[z.id] = `Below the lowest rate, ${rateWords(min, draft.rateUnit)}`;
    else if (inRange && r > max + eps)
      zones[z.id] = `Above the highest rate, ${rateWords(max, draft.rateUnit)}`;
  }
  const name = draft.name.trim() ? undefined : 'Give the prescription a name';
  return { name, bounds, zones };
}

export const hasProblems = (pr: DraftProblems) =>
  !!pr.name || Object.values(pr.bounds).some(Boolean) || Object.keys(pr.zones).length > 0;

/** The PUT body for a draft without problems. */
export function bodyOf(draft: Draft, p: Prescription, version: number): UpdatePrescriptionBody {
  return {
    version,
    name: draft.name,
    productId: p.product.id,
    planterId: p.planter?.id ?? null,
    rateUnit: draft.rateUnit,
    defaultRateSi: draft.defaultRateSi ?? p.defaultRateSi,
    outOfFieldRateSi: draft.outOfFieldRateSi ?? p.outOfFieldRateSi,
    minRateSi: draft.minRateSi ?? p.minRateSi,
    maxRateSi: draft.maxRateSi ?? p.maxRateSi,
    rates: p.zones.map((z) => ({ zoneId: z.id, rateSi: draft.rates[z.id] ?? z.rateSi })),
  };
}

/** A newer version that arrived while something was changed here, and the draft as it was opened. */
export type Conflict = { theirs: Prescription; opened: Draft };

/**
 * The editor's unsaved state over the prescription it was read from (`base`). When a newer version
 * arrives (saved here, or by someone else) and nothing is changed here, the draft follows it. When something
 * is changed here, the draft becomes the newer version with those changes laid over it, and `conflict`
 * says so until the person chooses: keep the changes (then save), or take the saved version as it is.
 */
export function useDraft(p: Prescription) {
  const [base, setBase] = useState(p);
  const [draft, setDraft] = useState(() => draftOf(p));
  const [conflict, setConflict] = useState<Conflict | null>(null);
  const dirty = !sameDraft(draft, draftOf(base));
  if (p !== base && (p.id !== base.id || p.version !== base.version)) {
    if (!dirty || p.id !== base.id) {
      setDraft(draftOf(p));
      setConflict(null);
    } else {
      const opened = conflict?.opened ?? draftOf(base);
      setDraft(overlay(draftOf(p), draft, opened));
      setConflict({ theirs: p, opened });
    }
    setBase(p);
  } else if (p !== base && !dirty) {
    // The same version read again: nothing to keep apart.
    setBase(p);
  }
  return {
    base,
    draft,
    dirty,
    conflict,
    set: (change: Partial<Draft>) => setDraft((d) => ({ ...d, ...change })),
    setRate: (zoneId: string, si: number | null) =>
      setDraft((d) => ({ ...d, rates: { ...d.rates, [zoneId]: si } })),
    /** After a save: the answer is the new base and the draft. */
    saved: (next: Prescription) => {
      setBase(next);
      setDraft(draftOf(next));
      setConflict(null);
    },
    /** Drop what was changed here and take the saved version. */
    takeTheirs: () => {
      setDraft(draftOf(base));
      setConflict(null);
    },
    /** Keep what was changed here over the saved version; the next save carries it. */
    keepMine: () => setConflict(null),
    discard: () => setDraft(draftOf(base)),
  };
}
