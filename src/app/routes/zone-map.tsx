import type { QueryClient } from '@tanstack/react-query';
import { Link, useNavigate, useParams, type LoaderFunction } from 'react-router-dom';
import type { ZoneMap } from '@shared/schemas/zone-map.schema';
import { ProblemList } from '@/components/form/problem-list';
import { Badge } from '@/components/ui/badge';
import { Button, buttonClass } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { PageHeader } from '@/components/ui/page-header';
import { QueryState } from '@/components/ui/query-state';
import { useNewZoneMapVersion } from '@/features/zones/api/new-version';
import { zoneMapQueryOptions, useZoneMap } from '@/features/zones/api/get-zone-map';
import { useZoneMaps } from '@/features/zones/api/get-zone-maps';
import { ZoneMapEditor } from '@/features/zones/components/zone-map-editor';
import { SOURCE_WORDS } from '@/features/zones/components/zone-map-table';
import { canEditRegister } from '@/lib/permissions';
import { useUnitSystem, useViewer } from '@/lib/viewer';

export const loader =
  (qc: QueryClient): LoaderFunction =>
  ({ params }) => {
    void qc.prefetchQuery(zoneMapQueryOptions(params.id ?? ''));
    return null;
  };

function Versions({ map }: { map: ZoneMap }) {
  const all = useZoneMaps({ fieldId: map.fieldId, seasonId: map.seasonId });
  const versions = [...(all.data ?? [])].sort((a, b) => a.versionNo - b.versionNo);
  if (versions.length < 2) return null;
  return (
    <nav aria-label="Versions" className="flex flex-wrap items-center gap-1.5 text-sm text-ink-soft">
      Versions for this season:
      {versions.map((v) =>
        v.id === map.id ? (
          <span
            key={v.id}
            aria-current="page"
            className="rounded-sm border border-clay-300 bg-clay-50 px-1.5 font-mono text-clay-700"
          >
            v{v.versionNo}
          </span>
        ) : (
          <Link
            key={v.id}
            to={`/zone-maps/${v.id}`}
            className="rounded-sm px-1.5 font-mono underline-offset-2 hover:text-clay-700 hover:underline"
          >
            v{v.versionNo}
          </Link>
        ),
      )}
    </nav>
  );
}

function ZoneMapPage({ map }: { map: ZoneMap }) {
  const system = useUnitSystem();
  const canEdit = canEditRegister(useViewer());
  const navigate = useNavigate();
  const copy = useNewZoneMapVersion();
  const exportHref = (format: 'geojson' | 'shapefile') => `/api/zone-maps/${map.id}/export?format=${format}`;
  return (
    <>
      <PageHeader
        title={
          <>
            {map.name}
            <Badge tone="accent">Version {map.versionNo}</Badge>
          </>
        }
        crumbs={[
          { label: 'Zone maps', to: '/zone-maps' },
          { label: map.fieldName, to: `/fields/${map.fieldId}` },
          { label: map.seasonLabel },
        ]}
        description={
          <>
            {map.fieldName}, {map.seasonLabel}. {SOURCE_WORDS[map.source]}
            {map.sourceNote ? `: ${map.sourceNote}` : ''}.
            {canEdit ? null : ' You can look and export; changes are made by the agronomist.'}
          </>
        }
        meta={<Versions map={map} />}
        actions={
          <>
            <a className={buttonClass('secondary', 'md')} href={exportHref('geojson')} download>
              Export GeoJSON
            </a>
            <a className={buttonClass('secondary', 'md')} href={exportHref('shapefile')} download>
              Export shapefile
            </a>
            {canEdit ? (
              <Button
                busy={copy.isPending}
                onClick={() =>
                  copy.mutate({ id: map.id }, { onSuccess: (m) => navigate(`/zone-maps/${m.id}`) })
                }
              >
                New version
              </Button>
            ) : null}
          </>
        }
      />
      {copy.isError ? (
        <Notice tone="danger" title="No new version" className="mb-4">
          <ProblemList error={copy.error} />
        </Notice>
      ) : null}
      <ZoneMapEditor key={map.id} map={map} system={system} canEdit={canEdit} />
    </>
  );
}

export function Component() {
  const { id = '' } = useParams();
  const map = useZoneMap(id);
  return <QueryState query={map}>{(m) => <ZoneMapPage map={m} />}</QueryState>;
}
