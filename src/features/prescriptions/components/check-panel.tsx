import { useState } from 'react';
import { Link } from 'react-router-dom';
import { CROP_LABELS } from '@shared/schemas/crops';
import type { Planter } from '@shared/schemas/planter.schema';
import type { Prescription, PlanterCheck } from '@shared/schemas/prescription.schema';
import { RATE_UNIT_DEFS, type RateUnit } from '@shared/rates/rate-units';
import { speedToDisplay, speedUnitLabel, type UnitSystem } from '@shared/units';
import { ProblemList } from '@/components/form/problem-list';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Facts } from '@/components/ui/facts';
import { FormField } from '@/components/ui/form-field';
import { Textarea } from '@/components/ui/input';
import { Notice } from '@/components/ui/notice';
import { formatDateTime, formatNumber, formatSpeed } from '@/lib/format';
import { useAcceptCheck } from '../api/life-cycle';
import { rateFigures } from './rate-values';
import { CHECK_LABEL, CHECK_TONE } from './rates-table';

const th = 'px-2 py-1.5 text-xs font-medium text-ink-soft';
const num = 'px-2 py-1.5 text-right font-mono tabular-nums';

/** "12 sections of 2 rows; display limit 16". */
export const sectionWords = (c: PlanterCheck['sections']) =>
  `${c.count} ${c.count === 1 ? 'section' : 'sections'} of ${c.rowsPerSection} ${c.rowsPerSection === 1 ? 'row' : 'rows'}; display limit ${c.limit}`;

/** The form that accepts a blocking check with a reason, so the prescription can be approved. */
function AcceptForm({ prescription: p }: { prescription: Prescription }) {
  const [reason, setReason] = useState('');
  const [tooShort, setTooShort] = useState(false);
  const accept = useAcceptCheck(p.id);
  const submit = () => {
    const short = reason.trim().length < 10;
    setTooShort(short);
    if (!short) accept.mutate({ id: p.id, version: p.version, reason: reason.trim() });
  };
  return (
    <div className="space-y-2 rounded-card border border-ink-line bg-paper-raised p-3">
      <p className="text-sm font-medium text-ink">Accept and explain</p>
      <p className="text-sm text-ink-soft">
        If the flagged rates are meant (the grower will plant those zones slower, or change the disc), say
        why. Your name, the time and the reason are kept with the prescription.
      </p>
      <FormField
        label="Why the planter can be left like this"
        error={tooShort ? 'Say it in a sentence: at least 10 characters.' : undefined}
      >
        <Textarea value={reason} maxLength={500} onChange={(e) => setReason(e.target.value)} />
      </FormField>
      {accept.isError ? (
        <Notice tone="danger" title="Not accepted">
          <ProblemList error={accept.error} />
        </Notice>
      ) : null}
      <Button busy={accept.isPending} onClick={submit}>
        Accept the check
      </Button>
    </div>
  );
}

/**
 * The planter check: the planter's disc and speeds, its sections against the display, and per zone the
 * seeds per second per row, the disc speed at the low, planned and high ground speed and the fastest speed
 * at which the rate can be delivered. Flagged zones are said in plain words.
 */
export function CheckPanel({
  prescription: p,
  planter,
  check,
  unit,
  system,
  dirty,
  canAccept,
}: {
  prescription: Prescription;
  planter: Planter | null;
  check: PlanterCheck | null;
  unit: RateUnit;
  system: UnitSystem;
  dirty: boolean;
  canAccept: boolean;
}) {
  if (p.product.kind !== 'seed') {
    return (
      <p className="text-sm text-ink-soft">{p.product.name} is not seed: there is no seed disc to check.</p>
    );
  }
  if (!planter || !check) {
    return (
      <p className="text-sm text-ink-soft">
        No planter was chosen for this prescription, so the rates are not checked against a seed disc.
      </p>
    );
  }
  const speed = (mps: number) => formatNumber(speedToDisplay(mps, system), 1);
  const speedUnit = speedUnitLabel(system);
  const flagged = check.zones.filter((z) => z.status !== 'ok');
  const accepted = p.acceptance;
  return (
    <div className="space-y-3">
      <Facts
        columns={4}
        items={[
          {
            label: 'Planter',
            value: (
              <Link
                to={`/planters/${planter.id}`}
                className="underline-offset-2 hover:text-clay-700 hover:underline"
              >
                {check.planterName}
              </Link>
            ),
          },
          {
            label: `Holes per disc (${CROP_LABELS[check.crop].toLowerCase()})`,
            value: check.holesPerDisc === null ? 'None set' : formatNumber(check.holesPerDisc),
            numeric: true,
          },
          {
            label: `Speeds: low / planned / high (${speedUnit})`,
            value: `${speed(check.speedsMps.low)} / ${speed(check.speedsMps.planned)} / ${speed(check.speedsMps.high)}`,
            numeric: true,
          },
          {
            label: 'Disc speed limits',
            value: `${formatNumber(planter.discRpmMin, 1)}–${formatNumber(planter.discRpmMax, 1)} rpm`,
            numeric: true,
          },
        ]}
      />
      <p
        className={`rounded-card border px-2.5 py-1.5 font-mono text-sm ${check.sections.ok ? 'border-ink-line bg-paper text-ink-soft' : 'border-caution/40 bg-caution-soft text-caution'}`}
      >
        {sectionWords(check.sections)}
      </p>
      {check.messages.map((m) => (
        <Notice key={m} tone="danger">
          {m}
        </Notice>
      ))}
      <div className="overflow-x-auto rounded-card border border-ink-line bg-paper-raised">
        <table className="w-full border-collapse text-sm" aria-label="Planter check">
          <thead>
            <tr className="border-b border-ink-line bg-paper-sunk/60">
              <th scope="col" className={`${th} text-left`} rowSpan={2}>
                Zone
              </th>
              <th scope="col" className={`${th} text-right`} rowSpan={2}>
                Rate ({RATE_UNIT_DEFS[unit].label})
              </th>
              <th scope="col" className={`${th} text-right`} rowSpan={2} title="At the planned speed">
                Seeds/s/row
              </th>
              <th scope="colgroup" className={`${th} text-center`} colSpan={3}>
                Disc rpm at low / planned / high speed
              </th>
              <th scope="col" className={`${th} text-right`} rowSpan={2}>
                Fastest ({speedUnit})
              </th>
              <th scope="col" className={`${th} text-left`} rowSpan={2}>
                Check
              </th>
            </tr>
            <tr className="border-b border-ink-line bg-paper-sunk/60">
              <th scope="col" className={`${th} text-right`}>
                {speed(check.speedsMps.low)}
              </th>
              <th scope="col" className={`${th} text-right`}>
                {speed(check.speedsMps.planned)}
              </th>
              <th scope="col" className={`${th} text-right`}>
                {speed(check.speedsMps.high)}
              </th>
            </tr>
          </thead>
          <tbody>
            {check.zones.map((z) => (
              <tr
                key={z.zoneId}
                data-check={z.status}
                className={`border-b border-ink-line/70 align-top last:border-b-0 ${z.status === 'flagged' ? 'bg-danger-soft/40' : ''}`}
              >
                <th scope="row" className="px-2 py-1.5 text-left font-normal">
                  <span className="font-medium text-ink">
                    {z.zoneId === 'default' ? 'Default rate' : z.name}
                  </span>
                  {z.messages.length ? (
                    <ul className="mt-0.5 space-y-0.5 text-xs text-ink-soft">
                      {z.messages.map((m) => (
                        <li key={m}>{m}</li>
                      ))}
                    </ul>
                  ) : null}
                </th>
                <td className={num}>{rateFigures(z.rateSi, unit)}</td>
                <td className={num}>{formatNumber(z.seedsPerSecondPerRow.planned, 1)}</td>
                <td className={num}>{formatNumber(z.discRpm.low, 1)}</td>
                <td className={`${num} font-medium`}>{formatNumber(z.discRpm.planned, 1)}</td>
                <td className={num}>{formatNumber(z.discRpm.high, 1)}</td>
                <td className={`${num} ${z.status === 'flagged' ? 'font-medium text-danger' : ''}`}>
                  {z.rateSi > 0 && check.holesPerDisc ? speed(z.fastestSpeedMps) : '—'}
                </td>
                <td className="px-2 py-1.5">
                  <Badge tone={CHECK_TONE[z.status]}>{CHECK_LABEL[z.status]}</Badge>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {flagged.length === 0 && !check.blocking ? (
        <p className="text-sm text-ok">Every rate can be delivered at every planned speed.</p>
      ) : null}
      {check.blocking ? (
        accepted && !dirty ? (
          <Notice tone="info" title="Check accepted">
            {accepted.acceptedBy.name}, {formatDateTime(accepted.acceptedAt)}: “{accepted.reason}”
          </Notice>
        ) : (
          <Notice tone="caution" title="The planter cannot deliver every rate">
            Flagged zones block approval. Change their rates, change the planter's disc or planned speed (now{' '}
            {formatSpeed(check.speedsMps.planned, system)}), or accept the check with a reason.
            {dirty && canAccept ? ' Save the rates first; then the check can be accepted.' : ''}
          </Notice>
        )
      ) : null}
      {check.blocking && !accepted && !dirty && canAccept && p.check?.blocking ? (
        <AcceptForm prescription={p} />
      ) : null}
    </div>
  );
}
