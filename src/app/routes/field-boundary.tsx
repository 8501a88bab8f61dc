import { useState } from 'react';
import type { QueryClient } from '@tanstack/react-query';
import { useNavigate, useParams, useSearchParams, type LoaderFunction } from 'react-router-dom';
import type { Field } from '@shared/schemas/field.schema';
import type { ImportPreview } from '@shared/schemas/import.schema';
import type { AreaGeometry } from '@/components/map/map-types';
import { ProblemList } from '@/components/form/problem-list';
import { NotAllowed } from '@/components/ui/not-allowed';
import { Notice } from '@/components/ui/notice';
import { PageHeader } from '@/components/ui/page-header';
import { QueryState } from '@/components/ui/query-state';
import { Section } from '@/components/ui/section';
import { Segmented } from '@/components/ui/segmented';
import { BoundaryDrawer } from '@/features/boundaries/components/boundary-drawer';
import { BoundaryFromFile } from '@/features/boundaries/components/boundary-from-file';
import { useCreateImport } from '@/features/imports/api/create-import';
import { FeaturePicker } from '@/features/imports/components/feature-picker';
import { ImportStep } from '@/features/imports/components/import-step';
import { fieldQueryOptions, useField } from '@/features/register/api/get-field';
import { canEditRegister } from '@/lib/permissions';
import { useUnitSystem, useViewer } from '@/lib/viewer';

export const loader =
  (qc: QueryClient): LoaderFunction =>
  ({ params }) => {
    void qc.prefetchQuery(fieldQueryOptions(params.id ?? ''));
    return null;
  };

type How = 'file' | 'draw';

function BoundaryPage({ field }: { field: Field }) {
  const system = useUnitSystem();
  const navigate = useNavigate();
  const [search, setSearch] = useSearchParams();
  const how: How = search.get('how') === 'draw' ? 'draw' : 'file';
  const [preview, setPreview] = useState<ImportPreview | null>(null);
  const [chosen, setChosen] = useState<number[]>([]);
  const check = useCreateImport();

  const ready = (p: ImportPreview | null) => {
    setPreview(p);
    // One feature: it is the boundary. Several: the user chooses.
    setChosen(p && p.features.length === 1 ? [0] : []);
  };
  const saved = () => navigate(`/fields/${field.id}`);
  // A drawn outline PostGIS refused: read it as an import, so its repair and change of area can be shown.
  const seeRepair = (geometry: AreaGeometry) => {
    const file = new File(
      [JSON.stringify({ type: 'Feature', properties: { name: 'Drawn outline' }, geometry })],
      'drawn-outline.geojson',
      {
        type: 'application/geo+json',
      },
    );
    check.mutate(
      { file, purpose: 'boundary', fieldId: field.id },
      {
        onSuccess: (p) => {
          ready(p);
          setSearch({ how: 'file' }, { replace: true });
        },
      },
    );
  };

  return (
    <>
      <PageHeader
        title={`Boundary of ${field.name}`}
        crumbs={[
          { label: 'Growers', to: '/growers' },
          { label: field.growerName, to: `/growers/${field.growerId}` },
          { label: field.farmName, to: `/fields?growerId=${field.growerId}&farmId=${field.farmId}` },
          { label: field.name, to: `/fields/${field.id}` },
          { label: 'Boundary' },
        ]}
        description="Bring the boundary in from the grower's file, or draw it on the map. Every area is measured on the WGS84 ellipsoid; nothing is stored until you save, and nothing invalid is ever stored."
      />
      <Segmented<How>
        label="How to make the boundary"
        value={how}
        options={[
          { value: 'file', label: 'From a file' },
          { value: 'draw', label: 'Draw on the map' },
        ]}
        onChange={(v) => setSearch({ how: v }, { replace: true })}
      />
      {check.isError ? (
        <Notice tone="danger" title="The outline could not be checked" className="mt-3">
          <ProblemList error={check.error} />
        </Notice>
      ) : null}
      {how === 'file' ? (
        <>
          <Section title="The file" className="mt-5">
            <ImportStep purpose="boundary" fieldId={field.id} preview={preview} onReady={ready} />
          </Section>
          {preview ? (
            preview.features.length === 0 ? (
              <Notice tone="caution" title="No polygons in this file" className="mt-5">
                A boundary is made of polygons; this file has none that Sowright could read. Choose another
                file.
              </Notice>
            ) : (
              <>
                <Section title="What makes the boundary">
                  <FeaturePicker
                    preview={preview}
                    system={system}
                    chosen={chosen}
                    onChange={setChosen}
                    context={field.boundary}
                  />
                </Section>
                <Section title="Save">
                  <BoundaryFromFile
                    field={field}
                    preview={preview}
                    chosen={chosen}
                    system={system}
                    onSaved={saved}
                  />
                </Section>
              </>
            )
          ) : null}
        </>
      ) : (
        <Section title="Draw the boundary" className="mt-5">
          <BoundaryDrawer field={field} system={system} onSaved={saved} onInvalid={seeRepair} />
        </Section>
      )}
    </>
  );
}

export function Component() {
  const { id = '' } = useParams();
  const field = useField(id);
  const allowed = canEditRegister(useViewer());
  if (!allowed) return <NotAllowed what="changing boundaries" />;
  return <QueryState query={field}>{(f) => <BoundaryPage field={f} />}</QueryState>;
}
