import type { ReactNode } from 'react';
import type { QueryClient } from '@tanstack/react-query';
import { Link, type LoaderFunction } from 'react-router-dom';
import { areaUnitLabel, areaToDisplay } from '@shared/units';
import { Loading } from '@/components/ui/loading';
import { PageHeader } from '@/components/ui/page-header';
import { ErrorNotice } from '@/components/ui/query-state';
import { Section } from '@/components/ui/section';
import { readyToExportQueryOptions } from '@/features/prescription-list/api/get-prescriptions';
import { ReadyToExport } from '@/features/prescription-list/components/ready-to-export';
import { farmsQueryOptions, useFarms } from '@/features/register/api/get-farms';
import { fieldsQueryOptions, useFields } from '@/features/register/api/get-fields';
import { growersQueryOptions, useGrowers } from '@/features/register/api/get-growers';
import { plantersQueryOptions, usePlanters } from '@/features/register/api/get-planters';
import { FieldTable } from '@/features/register/components/field-table';
import { GrowerTable } from '@/features/register/components/grower-table';
import { PlanterTable } from '@/features/register/components/planter-table';
import { formatNumber } from '@/lib/format';
import { canEditPlanter, canEditRegister } from '@/lib/permissions';
import { useUnitSystem, useViewer } from '@/lib/viewer';

export const loader =
  (qc: QueryClient): LoaderFunction =>
  () => {
    void qc.prefetchQuery(growersQueryOptions());
    void qc.prefetchQuery(farmsQueryOptions());
    void qc.prefetchQuery(fieldsQueryOptions());
    void qc.prefetchQuery(plantersQueryOptions());
    void qc.prefetchQuery(readyToExportQueryOptions());
    return null;
  };

function Tile({ label, value, to, sub }: { label: string; value: number; to: string; sub?: string }) {
  return (
    <Link
      to={to}
      className="group block rounded-card border border-ink-line bg-paper-raised px-4 py-3 hover:border-clay-300 hover:bg-clay-50"
    >
      <span className="block text-sm text-ink-soft group-hover:text-clay-700">{label}</span>
      <span className="block font-mono text-2xl text-ink tabular-nums">{formatNumber(value)}</span>
      {sub ? (
        <span className="block font-mono text-xs text-ink-faint">{sub}</span>
      ) : (
        <span className="block text-xs">&nbsp;</span>
      )}
    </Link>
  );
}

function ShortList({
  items,
  empty,
  more,
}: {
  items: { id: string; to: string; name: string; note: ReactNode }[];
  empty: string;
  more?: { to: string; label: string };
}) {
  if (items.length === 0) return <p className="text-sm text-ink-faint">{empty}</p>;
  return (
    <div>
      <ul className="divide-y divide-ink-line/70 rounded-card border border-ink-line bg-paper-raised">
        {items.map((i) => (
          <li key={i.id} className="flex items-baseline justify-between gap-3 px-3 py-1.5 text-sm">
            <Link
              to={i.to}
              className="truncate font-medium underline-offset-2 hover:text-clay-700 hover:underline"
            >
              {i.name}
            </Link>
            <span className="shrink-0 text-ink-soft">{i.note}</span>
          </li>
        ))}
      </ul>
      {more ? (
        <Link
          to={more.to}
          className="mt-1 inline-block text-sm text-clay-700 underline-offset-2 hover:underline"
        >
          {more.label}
        </Link>
      ) : null}
    </div>
  );
}

const SHORT = 6;

export function Component() {
  const me = useViewer();
  const system = useUnitSystem();
  const growers = useGrowers();
  const farms = useFarms();
  const fields = useFields();
  const planters = usePlanters();
  const queries = [growers, farms, fields, planters];
  const failed = queries.find((q) => q.isError);
  const description = {
    admin: `Everything in ${me.workspace.name}.`,
    agronomist: `Everything in ${me.workspace.name}.`,
    farmer: 'Your farms, fields and planters.',
    consultant: 'The growers assigned to you.',
  }[me.role];

  const farmer = me.role === 'farmer';
  const ready = (
    <Section title="Ready to export" className={farmer ? 'mb-7' : 'mt-7'}>
      <ReadyToExport
        showGrower={!farmer}
        limit={farmer ? undefined : SHORT}
        empty={
          farmer
            ? 'When your agronomist approves a prescription it is listed here, and you get an e-mail.'
            : 'Approved prescriptions are listed here until they are replaced by a newer version.'
        }
      />
    </Section>
  );

  let body: ReactNode;
  if (failed)
    body = <ErrorNotice error={failed.error} onRetry={() => queries.forEach((q) => void q.refetch())} />;
  else if (!growers.data || !farms.data || !fields.data || !planters.data) body = <Loading />;
  else {
    const totalM2 = fields.data.reduce((sum, f) => sum + (f.areaM2 ?? 0), 0);
    const missing = fields.data.filter((f) => !f.boundary);
    const ownGrower = me.role === 'farmer' ? growers.data[0] : undefined;
    body = (
      <>
        <div className="grid grid-cols-2 gap-3 lg:grid-cols-4">
          <Tile
            label={me.role === 'farmer' ? 'Grower' : 'Growers'}
            value={growers.data.length}
            to="/growers"
          />
          <Tile label="Farms" value={farms.data.length} to="/farms" />
          <Tile
            label="Fields"
            value={fields.data.length}
            to="/fields"
            sub={`${formatNumber(areaToDisplay(totalM2, system), 1)} ${areaUnitLabel(system)} inside boundaries`}
          />
          <Tile label="Planters" value={planters.data.length} to="/planters" />
        </div>

        {me.role === 'farmer' ? (
          <>
            <Section title={ownGrower ? ownGrower.name : 'Your grower'}>
              {ownGrower ? (
                <p className="text-sm text-ink-soft">
                  {[ownGrower.contactName, ownGrower.email, ownGrower.phone].filter(Boolean).join(' · ') ||
                    'No contact details on file.'}{' '}
                  <Link
                    to={`/growers/${ownGrower.id}`}
                    className="text-clay-700 underline-offset-2 hover:underline"
                  >
                    Open
                  </Link>
                </p>
              ) : (
                <p className="text-sm text-ink-faint">
                  Your account is not linked to a grower yet. Ask your agronomist.
                </p>
              )}
            </Section>
            <Section title="Your fields">
              <FieldTable fields={fields.data} canEdit={false} hiddenColumns={['grower', 'updated']} />
            </Section>
            <Section title="Your planters">
              <PlanterTable
                planters={planters.data}
                canEdit={(p) => canEditPlanter(me, p.growerId)}
                hiddenColumns={['grower']}
              />
            </Section>
          </>
        ) : me.role === 'consultant' ? (
          <Section title="Growers assigned to you">
            <GrowerTable growers={growers.data} canEdit={false} />
          </Section>
        ) : (
          <div className="mt-7 grid gap-x-6 gap-y-7 lg:grid-cols-2">
            <Section title="Growers" className="">
              <ShortList
                empty="No growers yet."
                items={[...growers.data]
                  .sort((a, b) => a.name.localeCompare(b.name))
                  .slice(0, SHORT)
                  .map((g) => ({
                    id: g.id,
                    to: `/growers/${g.id}`,
                    name: g.name,
                    note: (
                      <span className="font-mono text-xs">
                        {g.fieldCount} {g.fieldCount === 1 ? 'field' : 'fields'} · {g.planterCount}{' '}
                        {g.planterCount === 1 ? 'planter' : 'planters'}
                      </span>
                    ),
                  }))}
                more={
                  growers.data.length > SHORT
                    ? { to: '/growers', label: `All ${growers.data.length} growers` }
                    : undefined
                }
              />
            </Section>
            <Section title="Fields without a boundary" className="">
              <ShortList
                empty="Every field has a boundary."
                items={missing.slice(0, SHORT).map((f) => ({
                  id: f.id,
                  to: `/fields/${f.id}`,
                  name: f.name,
                  note: `${f.farmName}, ${f.growerName}`,
                }))}
                more={
                  missing.length > SHORT
                    ? { to: '/fields', label: `All ${missing.length} fields without one` }
                    : undefined
                }
              />
            </Section>
          </div>
        )}
        {canEditRegister(me) && growers.data.length === 0 ? (
          <p className="mt-6 text-sm text-ink-soft">
            Start by{' '}
            <Link to="/growers/new" className="text-clay-700 underline">
              adding a grower
            </Link>
            , then its farms, fields and planters.
          </p>
        ) : null}
      </>
    );
  }

  return (
    <>
      <PageHeader title="Overview" description={description} />
      {farmer ? ready : null}
      {body}
      {farmer ? null : ready}
    </>
  );
}
