import { useMemo, useState } from 'react';
import type {
  Prescription,
  PlanterCheck,
  PrescriptionTotals,
  ZoneCheck,
} from '@shared/schemas/prescription.schema';
import { checkPlanter } from '@shared/rates/planter-check';
import { prescriptionTotals } from '@shared/rates/totals';
import { RATE_UNIT_DEFS, rateUnitsOf, type RateUnit } from '@shared/rates/rate-units';
import type { UnitSystem } from '@shared/units';
import { ProblemList } from '@/components/form/problem-list';
import { isStaleVersion } from '@/components/form/use-save-errors';
import { Button } from '@/components/ui/button';
import { Facts } from '@/components/ui/facts';
import { FormField } from '@/components/ui/form-field';
import { Input } from '@/components/ui/input';
import { Notice } from '@/components/ui/notice';
import { Section } from '@/components/ui/section';
import { Segmented } from '@/components/ui/segmented';
import { isApiError } from '@/lib/api-client';
import { useUpdatePrescription } from '../api/update-prescription';
import { Cautions } from './cautions';
import { CheckPanel } from './check-panel';
import { ExportPanel } from './export-panel';
import { approvalBlock, LifeCycle } from './life-cycle';
import { RateInput } from './rate-input';
import { RateMap, rateColouring, type MapZone } from './rate-map';
import { rateFigures } from './rate-values';
import { RatesTable, rateInputId } from './rates-table';
import { RulePanel } from './rule-panel';
import { TotalsPanel } from './totals-panel';
import { ConflictNotice } from './conflict-notice';
import {
  BOUND_KEYS,
  BOUND_LABELS,
  bodyOf,
  hasProblems,
  problemsOf,
  useDraft,
  type BoundKey,
} from './use-draft';

/** Less uncovered area than this (m²) is the slivers of polygon arithmetic: not worth a note. */
const UNCOVERED_NOTE_M2 = 20;

/** What the server refused in a save, placed beside the zone or the input it names. */
type ServerProblems = {
  zones: Record<string, string>;
  bounds: Partial<Record<BoundKey, string>>;
  rest: unknown;
};

function serverProblemsOf(error: unknown, zoneIds: string[]): ServerProblems {
  const out: ServerProblems = { zones: {}, bounds: {}, rest: null };
  if (!isApiError(error) || error.details.length === 0) return { ...out, rest: error };
  for (const d of error.details) {
    const [head, i] = d.path;
    if (head === 'rates' && typeof i === 'number' && zoneIds[i]) out.zones[zoneIds[i]] = d.message;
    else if ((BOUND_KEYS as readonly unknown[]).includes(head)) out.bounds[head as BoundKey] = d.message;
    else out.rest = error;
  }
  return out;
}

/**
 * A prescription: its zones on the map, coloured by rate, beside the table of zone rates; the rate rule,
 * the planter check and the totals under them, worked out as rates are typed; its life cycle and, once
 * approved, its exports. Rates change only in a draft and only for admins and agronomists; everyone else
 * reads. Nothing is saved until Save.
 */
export function PrescriptionEditor({
  prescription: latest,
  system,
  canWrite,
  canExport,
}: {
  prescription: Prescription;
  system: UnitSystem;
  canWrite: boolean;
  canExport: boolean;
}) {
  const d = useDraft(latest);
  const { draft, base } = d;
  const p = base;
  const editable = canWrite && latest.status === 'draft';
  const [viewUnit, setViewUnit] = useState<RateUnit>(latest.rateUnit);
  const unit = editable ? draft.rateUnit : viewUnit;
  const [selectedId, setSelectedId] = useState<string | null>(null);
  const [server, setServer] = useState<ServerProblems | null>(null);
  const [stale, setStale] = useState(false);
  const update = useUpdatePrescription(p.id);

  const rateOf = (zoneId: string, saved: number) => draft.rates[zoneId] ?? saved;
  const problems = problemsOf(draft, p);
  const blocked = hasProblems(problems);

  // The check and the totals of the rates as typed, with the same shared functions the server uses.
  const defaultSi = draft.defaultRateSi ?? p.defaultRateSi;
  const ratesKey = JSON.stringify(draft.rates);
  const check = useMemo<PlanterCheck | null>(() => {
    if (p.product.kind !== 'seed' || !p.planter) return null;
    try {
      return checkPlanter({
        planter: p.planter,
        crop: p.crop,
        zones: [
          ...p.zones.map((z) => ({ zoneId: z.id, name: z.name, rateSi: rateOf(z.id, z.rateSi) })),
          { zoneId: 'default', name: 'Default rate', rateSi: defaultSi },
        ],
        unitSystem: system,
        rateUnit: unit,
      });
    } catch {
      return latest.check;
    }
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [p, ratesKey, defaultSi, system, unit, latest.check]);
  const totals = useMemo<PrescriptionTotals>(() => {
    try {
      return prescriptionTotals({
        zones: p.zones.map((z) => ({
          zoneId: z.id,
          name: z.name,
          areaM2: z.areaM2,
          rateSi: rateOf(z.id, z.rateSi),
        })),
        uncoveredAreaM2: p.uncoveredAreaM2,
        defaultRateSi: defaultSi,
        unitSize: p.product.unitSize,
        pricePerUnit: p.product.pricePerUnit,
      });
    } catch {
      return latest.totals;
    }
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [p, ratesKey, defaultSi, latest.totals]);
  const checks = useMemo(
    () => (check ? new Map<string, ZoneCheck>(check.zones.map((z) => [z.zoneId, z])) : null),
    [check],
  );

  const rates = p.zones.map((z) => rateOf(z.id, z.rateSi));
  const lowSi = Math.min(draft.minRateSi ?? Infinity, ...rates);
  const highSi = Math.max(draft.maxRateSi ?? -Infinity, ...rates);
  const colourOf = useMemo(() => rateColouring(lowSi, highSi), [lowSi, highSi]);
  const mapZones = useMemo<MapZone[]>(
    () =>
      p.zones.map((z) => ({
        id: z.id,
        name: z.name,
        geometry: z.geometry,
        areaM2: z.areaM2,
        rateSi: rateOf(z.id, z.rateSi),
        check: checks?.get(z.id),
      })),
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [p, ratesKey, checks],
  );

  const chooseOnMap = (id: string) => {
    setSelectedId(id);
    const input = document.getElementById(rateInputId(id));
    if (input) input.focus();
    else
      document
        .querySelector(`[aria-label="Zone rates"] tr[aria-selected="true"]`)
        ?.scrollIntoView({ block: 'nearest' });
  };

  const edited = () => {
    setServer(null);
    setStale(false);
  };

  const save = () => {
    if (blocked) return;
    edited();
    update.mutate(
      { id: p.id, input: bodyOf(draft, p, p.version) },
      {
        onSuccess: (next) => d.saved(next),
        onError: (e) => {
          if (isStaleVersion(e)) setStale(true);
          else
            setServer(
              serverProblemsOf(
                e,
                p.zones.map((z) => z.id),
              ),
            );
        },
      },
    );
  };

  const zoneProblems = { ...server?.zones, ...problems.zones };
  const boundProblem = (k: BoundKey) => problems.bounds[k] ?? server?.bounds[k];
  const block = approvalBlock(latest, d.dirty, blocked);
  const units = rateUnitsOf(p.product.rateKind);
  const conflict = d.conflict;

  return (
    <div className="space-y-5">
      <LifeCycle prescription={latest} canWrite={canWrite} block={block} />
      {conflict ? (
        <ConflictNotice
          mine={draft}
          conflict={conflict}
          onKeepMine={() => {
            setStale(false);
            d.keepMine();
          }}
          onTakeTheirs={() => {
            setStale(false);
            d.takeTheirs();
          }}
        />
      ) : stale ? (
        <Notice tone="caution" title="Someone else saved this prescription">
          Loading the saved version; your typed values stay here.
        </Notice>
      ) : null}
      {server?.rest ? (
        <Notice tone="danger" title="Not saved">
          <ProblemList error={server.rest} />
        </Notice>
      ) : null}

      <div className="grid gap-4 xl:grid-cols-[minmax(0,5fr)_minmax(0,6fr)]">
        <div className="self-start xl:sticky xl:top-3">
          <RateMap
            label={`Rates of ${p.fieldName}, ${p.name}`}
            boundary={p.boundary}
            zones={mapZones}
            unit={unit}
            lowSi={lowSi}
            highSi={highSi}
            selectedId={selectedId}
            onSelect={chooseOnMap}
            system={system}
            fitKey={p.id}
          />
        </div>
        <div className="min-w-0 space-y-3">
          <div className="flex flex-wrap items-center justify-between gap-2">
            {units.length > 1 ? (
              <Segmented<RateUnit>
                label="Rate unit"
                value={unit}
                options={units.map((u) => ({ value: u, label: RATE_UNIT_DEFS[u].label }))}
                onChange={(u) => (editable ? d.set({ rateUnit: u }) : setViewUnit(u))}
              />
            ) : (
              <span className="text-sm text-ink-soft">
                Rates in {RATE_UNIT_DEFS[unit].title.toLowerCase()}
              </span>
            )}
            {editable ? (
              <span className="flex items-center gap-2">
                <span className="text-sm text-ink-soft" role="status">
                  {d.dirty ? 'Unsaved changes' : 'All saved'}
                </span>
                {d.dirty ? (
                  <Button variant="ghost" onClick={() => d.discard()}>
                    Undo changes
                  </Button>
                ) : null}
                <Button
                  variant="primary"
                  busy={update.isPending}
                  disabled={!d.dirty || blocked || !!conflict}
                  onClick={save}
                >
                  Save
                </Button>
              </span>
            ) : null}
          </div>
          <RatesTable
            zones={p.zones}
            rates={draft.rates}
            unit={unit}
            colourOf={colourOf}
            checks={checks}
            problems={zoneProblems}
            editable={editable}
            selectedId={selectedId}
            onSelect={setSelectedId}
            onRate={(id, si) => {
              edited();
              d.setRate(id, si);
            }}
            system={system}
          />
          {check ? (
            <p className="text-xs text-ink-soft">
              Seeds per second per row and disc rpm at the planned speed; the planter check below has the low
              and high speed too.
            </p>
          ) : null}
          {editable ? (
            <div className="grid gap-3 sm:grid-cols-2">
              <FormField label="Name" error={problems.name} className="sm:col-span-2">
                <Input
                  value={draft.name}
                  maxLength={120}
                  onChange={(e) => {
                    edited();
                    d.set({ name: e.target.value });
                  }}
                />
              </FormField>
              {BOUND_KEYS.map((k) => (
                <FormField
                  key={k}
                  label={BOUND_LABELS[k]}
                  unit={RATE_UNIT_DEFS[unit].label}
                  error={boundProblem(k)}
                >
                  <RateInput
                    valueSi={draft[k]}
                    unit={unit}
                    onChange={(si) => {
                      edited();
                      d.set({ [k]: si });
                    }}
                  />
                </FormField>
              ))}
            </div>
          ) : (
            <Facts
              columns={2}
              items={BOUND_KEYS.map((k) => ({
                label: `${BOUND_LABELS[k]} (${RATE_UNIT_DEFS[unit].label})`,
                value: rateFigures(p[k], unit),
                numeric: true,
              }))}
            />
          )}
          {p.uncoveredAreaM2 >= UNCOVERED_NOTE_M2 ? (
            <p className="text-xs text-ink-soft">
              Part of the field lies in no zone: it is planted at the default rate (see the totals).
            </p>
          ) : null}
        </div>
      </div>

      {p.product.kind === 'seed' ? <Cautions which={['treated-seed']} /> : null}

      <Section title="Planter check">
        <CheckPanel
          prescription={latest}
          planter={p.planter}
          check={check}
          unit={unit}
          system={system}
          dirty={d.dirty}
          canAccept={editable}
        />
      </Section>

      <div className={`grid gap-x-6 ${editable ? 'xl:grid-cols-2' : ''}`}>
        {editable ? (
          <Section title="Rates by rule" className="mt-7">
            <RulePanel
              zones={p.zones}
              rates={draft.rates}
              unit={unit}
              defaults={{ baseSi: draft.defaultRateSi, minSi: draft.minRateSi, maxSi: draft.maxRateSi }}
              onUse={(next) => {
                edited();
                d.set({ rates: { ...draft.rates, ...next } });
              }}
            />
          </Section>
        ) : null}
        <Section title="Totals" className="mt-7">
          <TotalsPanel totals={totals} product={p.product} unit={unit} system={system} />
        </Section>
      </div>

      <Section title="Exports" className="mt-7">
        {latest.status === 'draft' ? (
          <p className="text-sm text-ink-soft">Exports open once this version is approved.</p>
        ) : canExport ? (
          <ExportPanel prescription={latest} />
        ) : (
          <p className="text-sm text-ink-soft">
            The grower&apos;s farmers and the agronomists export prescriptions.
          </p>
        )}
      </Section>
    </div>
  );
}
