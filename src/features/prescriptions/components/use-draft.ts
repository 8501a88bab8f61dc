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

/**
 * The editor's unsaved state over the prescription it was read from (`base`). When a newer version
 * arrives (saved here, or by someone else) and nothing is changed here, the draft follows it; when
 * something is changed here, the typed values stay and `conflict` holds the newer version until the person
 * chooses: keep theirs, or save theirs over with the typed values.
 */
export function useDraft(p: Prescription) {
  const [base, setBase] = useState(p);
  const [draft, setDraft] = useState(() => draftOf(p));
  const [conflict, setConflict] = useState<Prescription | null>(null);
  const dirty = !sameDraft(draft, draftOf(base));
  if (p !== base && (p.id !== base.id || p.version !== base.version)) {
    if (!dirty || p.id !== base.id) {
      setBase(p);
      setDraft(draftOf(p));
      setConflict(null);
    } else if (conflict?.version !== p.version) {
      setConflict(p);
    }
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
    /** Drop what is typed here and take the newer version. */
    takeTheirs: () => {
      const next = conflict ?? p;
      setBase(next);
      setDraft(draftOf(next));
      setConflict(null);
    },
    /** Keep what is typed here; the next save goes over the newer version. */
    keepMine: () => {
      if (conflict) setBase(conflict);
      setConflict(null);
    },
    discard: () => setDraft(draftOf(base)),
  };
}
