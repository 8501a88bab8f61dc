import type { QueryClient } from '@tanstack/react-query';
import { useParams, type LoaderFunction } from 'react-router-dom';
import type { Field } from '@shared/schemas/field.schema';
import { areaToDisplay, areaUnitLabel } from '@shared/units';
import { Badge } from '@/components/ui/badge';
import { ButtonLink } from '@/components/ui/button';
import { Facts } from '@/components/ui/facts';
import { QueryState } from '@/components/ui/query-state';
import { Section } from '@/components/ui/section';
import { fieldQueryOptions, useField } from '@/features/register/api/get-field';
import { seasonsQueryOptions, useSeasons } from '@/features/register/api/get-seasons';
import { BoundaryOutline } from '@/features/register/components/boundary-outline';
import { SeasonTable } from '@/features/register/components/season-table';
import { RecordHeader } from '@/features/register/components/record-header';
import { zoneMapsQueryOptions, useZoneMaps } from '@/features/zones/api/get-zone-maps';
import { ZoneMapTable } from '@/features/zones/components/zone-map-table';
import { formatArea, formatNumber } from '@/lib/format';
import { canEditRegister } from '@/lib/permissions';
import { useUnitSystem, useViewer } from '@/lib/viewer';

export const loader =
  (qc: QueryClient): LoaderFunction =>
  ({ params }) => {
    const fieldId = params.id ?? '';
    void qc.prefetchQuery(fieldQueryOptions(fieldId));
    void qc.prefetchQuery(seasonsQueryOptions({ fieldId }));
    void qc.prefetchQuery(zoneMapsQueryOptions({ fieldId }));
    return null;
  };

function FieldPage({ field }: { field: Field }) {
  const me = useViewer();
  const system = useUnitSystem();
  const canEdit = canEditRegister(me);
  const seasons = useSeasons({ fieldId: field.id });
  const zoneMaps = useZoneMaps({ fieldId: field.id });
  const other = system === 'imperial' ? 'metric' : 'imperial';
  return (
    <>
      <RecordHeader
        resource="fields"
        record={field}
        canEdit={canEdit}
        crumbs={[
          { label: 'Growers', to: '/growers' },
          { label: field.growerName, to: `/growers/${field.growerId}` },
          { label: field.farmName, to: `/fields?growerId=${field.growerId}&farmId=${field.farmId}` },
        ]}
      />
      <div className="flex flex-wrap items-start gap-5">
        <div className="min-w-72 flex-1">
          <Facts
            columns={2}
            items={[
              { label: 'Grower', value: field.growerName },
              { label: 'Farm', value: field.farmName },
              {
                label: `Area (${areaUnitLabel(system)})`,
                numeric: true,
                value:
                  field.areaM2 == null ? (
                    <span className="font-sans text-ink-faint">No boundary yet</span>
                  ) : (
                    <>
                      {formatNumber(areaToDisplay(field.areaM2, system), 1)}
                      <span className="ml-2 text-sm text-ink-faint">= {formatArea(field.areaM2, other)}</span>
                    </>
                  ),
              },
              {
                label: 'Boundary',
                value: field.boundary ? (
                  <Badge tone="ok">
                    On file: {field.boundary.coordinates.length}{' '}
                    {field.boundary.coordinates.length === 1 ? 'part' : 'parts'}
                  </Badge>
                ) : (
                  <Badge tone="caution">Missing</Badge>
                ),
              },
            ]}
          />
          {field.notes ? (
            <p className="mt-3 text-sm whitespace-pre-line text-ink-soft">{field.notes}</p>
          ) : null}
          {field.boundary ? null : (
            <p className="mt-3 text-sm text-ink-soft">
              No boundary is on file. Zones and rates are planned inside a boundary, so this field needs one
              first.
            </p>
          )}
          {canEdit && !field.archivedAt ? (
            <div className="mt-3 flex flex-wrap gap-2">
              <ButtonLink
                variant={field.boundary ? 'secondary' : 'primary'}
                size="sm"
                to={`/fields/${field.id}/boundary`}
              >
                {field.boundary ? 'Change the boundary' : 'Bring in a boundary'}
              </ButtonLink>
              {field.boundary ? (
                <ButtonLink size="sm" to={`/fields/${field.id}/boundary?how=draw`}>
                  Edit it on the map
                </ButtonLink>
              ) : null}
            </div>
          ) : null}
        </div>
        {field.boundary ? (
          <figure className="shrink-0">
            <BoundaryOutline boundary={field.boundary} label={`Outline of the boundary of ${field.name}`} />
            <figcaption className="mt-1 text-center text-xs text-ink-faint">
              Outline, north up; not to a map scale
            </figcaption>
          </figure>
        ) : null}
      </div>
      <Section
        title="Crop seasons"
        actions={
          canEdit ? (
            <ButtonLink size="sm" to={`/seasons/new?growerId=${field.growerId}&fieldId=${field.id}`}>
              Add crop season
            </ButtonLink>
          ) : null
        }
      >
        <QueryState query={seasons}>
          {(data) => (
            <SeasonTable seasons={data} canEdit={canEdit} hiddenColumns={['field', 'farm', 'grower']} />
          )}
        </QueryState>
      </Section>
      <Section
        title="Zone maps"
        actions={
          canEdit && field.boundary && !field.archivedAt ? (
            <ButtonLink size="sm" to={`/zone-maps/new?fieldId=${field.id}`}>
              New zone map
            </ButtonLink>
          ) : null
        }
      >
        <QueryState query={zoneMaps}>
          {(items) => (
            <ZoneMapTable
              items={items}
              hiddenColumns={['field']}
              empty={
                field.boundary
                  ? 'Management zones for a crop season of this field: from a file, from data, or drawn.'
                  : 'Zone maps need a boundary: bring one in first.'
              }
            />
          )}
        </QueryState>
      </Section>
    </>
  );
}

export function Component() {
  const { id = '' } = useParams();
  const field = useField(id);
  return <QueryState query={field}>{(f) => <FieldPage field={f} />}</QueryState>;
}
