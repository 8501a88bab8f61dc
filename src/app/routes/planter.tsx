import type { QueryClient } from '@tanstack/react-query';
import { useParams, type LoaderFunction } from 'react-router-dom';
import { CROP_LABELS } from '@shared/schemas/crops';
import { ARRANGEMENT_LABELS, GROUND_SPEED_SOURCE_LABELS, type Planter } from '@shared/schemas/planter.schema';
import { Facts } from '@/components/ui/facts';
import { QueryState } from '@/components/ui/query-state';
import { Section } from '@/components/ui/section';
import { planterQueryOptions, usePlanter } from '@/features/register/api/get-planter';
import { SectionLine } from '@/features/register/components/section-line';
import { logbookQueryOptions } from '@/features/logbook/api/get-logbook';
import { PlanterLogbook } from '@/features/logbook/components/planter-logbook';
import { RecordHeader } from '@/features/register/components/record-header';
import { formatNumber, formatRowSpacing, formatSpeed } from '@/lib/format';
import { canEditPlanter } from '@/lib/permissions';
import { useUnitSystem, useViewer } from '@/lib/viewer';

export const loader =
  (qc: QueryClient): LoaderFunction =>
  ({ params }) => {
    void qc.prefetchQuery(planterQueryOptions(params.id ?? ''));
    void qc.prefetchQuery(logbookQueryOptions(params.id ?? ''));
    return null;
  };

function PlanterPage({ planter: p }: { planter: Planter }) {
  const me = useViewer();
  const system = useUnitSystem();
  const canEdit = canEditPlanter(me, p.growerId);
  return (
    <>
      <RecordHeader
        resource="planters"
        record={p}
        canEdit={canEdit}
        crumbs={[
          { label: 'Planters', to: '/planters' },
          { label: p.growerName, to: `/growers/${p.growerId}` },
        ]}
      />
      <Section title="Rows and sections">
        <Facts
          columns={4}
          items={[
            { label: 'Rows', value: formatNumber(p.rowCount), numeric: true },
            { label: 'Row spacing', value: formatRowSpacing(p.rowSpacingM, system), numeric: true },
            {
              label: 'Row arrangement',
              value:
                p.arrangement === 'split-row' && p.interplantRowCount != null
                  ? `Split-row, ${p.interplantRowCount} interplant rows`
                  : ARRANGEMENT_LABELS[p.arrangement],
            },
            {
              label: `Sections (display controls ${p.displaySectionLimit})`,
              value: formatNumber(p.sectionCount),
              numeric: true,
            },
          ]}
        />
        <div className="mt-2">
          <SectionLine rows={p.rowCount} perSection={p.rowsPerSection} limit={p.displaySectionLimit} />
        </div>
      </Section>
      <Section title="Seed meter">
        <div className="flex flex-wrap gap-5">
          <table className="min-w-64 border-collapse overflow-hidden rounded-card border border-ink-line bg-paper-raised text-sm">
            <caption className="sr-only">Holes per disc by crop</caption>
            <thead>
              <tr className="border-b border-ink-line bg-paper-sunk/60 text-xs text-ink-soft">
                <th scope="col" className="px-3 py-1.5 text-left font-medium">
                  Crop
                </th>
                <th scope="col" className="px-3 py-1.5 text-right font-medium">
                  Holes per disc
                </th>
              </tr>
            </thead>
            <tbody>
              {p.holesPerDisc.map((h) => (
                <tr key={h.crop} className="border-b border-ink-line/70 last:border-b-0">
                  <td className="px-3 py-1.5">{CROP_LABELS[h.crop]}</td>
                  <td className="px-3 py-1.5 text-right font-mono tabular-nums">{h.holes}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <div className="min-w-64 flex-1">
            <Facts
              columns={2}
              items={[
                { label: 'Lowest disc speed', value: `${formatNumber(p.discRpmMin, 1)} rpm`, numeric: true },
                { label: 'Highest disc speed', value: `${formatNumber(p.discRpmMax, 1)} rpm`, numeric: true },
              ]}
            />
          </div>
        </div>
      </Section>
      <Section title="Ground speed">
        <Facts
          columns={4}
          items={[
            { label: 'Lowest', value: formatSpeed(p.speedMinMps, system), numeric: true },
            { label: 'Planned', value: formatSpeed(p.speedPlannedMps, system), numeric: true },
            { label: 'Highest', value: formatSpeed(p.speedMaxMps, system), numeric: true },
            { label: 'Measured by', value: GROUND_SPEED_SOURCE_LABELS[p.groundSpeedSource] },
          ]}
        />
        {p.groundSpeedSource === 'wheel' ? (
          <p className="mt-2 text-sm text-ink-soft">
            A wheel sensor reads high when the wheel slips, and the meter then sows more than the target; GNSS
            measures true speed over the ground.
          </p>
        ) : null}
      </Section>
      <Section title="Logbook">
        <PlanterLogbook planterId={p.id} system={system} />
      </Section>
      {p.notes ? (
        <Section title="Notes">
          <p className="max-w-3xl text-sm whitespace-pre-line text-ink-soft">{p.notes}</p>
        </Section>
      ) : null}
    </>
  );
}

export function Component() {
  const { id = '' } = useParams();
  const planter = usePlanter(id);
  return <QueryState query={planter}>{(p) => <PlanterPage planter={p} />}</QueryState>;
}
