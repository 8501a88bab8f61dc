import { useState } from 'react';
import type { QueryClient } from '@tanstack/react-query';
import { Link, useNavigate, useSearchParams, type LoaderFunction } from 'react-router-dom';
import { CROP_LABELS } from '@shared/schemas/crops';
import type { Field } from '@shared/schemas/field.schema';
import type { ImportPreview } from '@shared/schemas/import.schema';
import type { ZoneMap } from '@shared/schemas/zone-map.schema';
import { ButtonLink } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { NotAllowed } from '@/components/ui/not-allowed';
import { Notice } from '@/components/ui/notice';
import { PageHeader } from '@/components/ui/page-header';
import { QueryState } from '@/components/ui/query-state';
import { Section } from '@/components/ui/section';
import { Segmented } from '@/components/ui/segmented';
import { FeaturePicker } from '@/features/imports/components/feature-picker';
import { ImportStep } from '@/features/imports/components/import-step';
import { fieldQueryOptions, useField } from '@/features/register/api/get-field';
import { seasonsQueryOptions, useSeasons } from '@/features/register/api/get-seasons';
import { CreateDefaultZoneMap } from '@/features/zones/components/create-default-zone-map';
import { ZoneMapBasicsFields, type ZoneMapBasics } from '@/features/zones/components/zone-map-basics';
import { ZonesFromDataForm } from '@/features/zones/components/zones-from-data-form';
import { ZonesFromImportForm } from '@/features/zones/components/zones-from-import-form';
import { canEditRegister } from '@/lib/permissions';
import { useUnitSystem, useViewer } from '@/lib/viewer';

export const loader =
  (qc: QueryClient): LoaderFunction =>
  ({ request }) => {
    const fieldId = new URL(request.url).searchParams.get('fieldId') ?? '';
    if (fieldId) {
      void qc.prefetchQuery(fieldQueryOptions(fieldId));
      void qc.prefetchQuery(seasonsQueryOptions({ fieldId }));
    }
    return null;
  };

type How = 'default' | 'file' | 'data';
const HOW: { value: How; label: string }[] = [
  { value: 'default', label: 'One zone to start from' },
  { value: 'file', label: 'Zones from a file' },
  { value: 'data', label: 'Zones from data' },
];

function NewZoneMap({ field, initialSeasonId }: { field: Field; initialSeasonId: string }) {
  const system = useUnitSystem();
  const navigate = useNavigate();
  const [search, setSearch] = useSearchParams();
  const how = (HOW.find((h) => h.value === search.get('how'))?.value ?? 'default') as How;
  const seasons = useSeasons({ fieldId: field.id });
  const options = (seasons.data ?? []).map((s) => ({
    id: s.id,
    label: `${s.year} ${CROP_LABELS[s.crop].toLowerCase()}`,
  }));
  const [chosenBasics, setBasics] = useState<ZoneMapBasics>({
    seasonId: initialSeasonId,
    name: 'Management zones',
  });
  // A field with one crop season: that one, unless the user chose otherwise.
  const basics = {
    ...chosenBasics,
    seasonId: chosenBasics.seasonId || (options.length === 1 ? options[0].id : ''),
  };
  const [preview, setPreview] = useState<ImportPreview | null>(null);
  const [chosen, setChosen] = useState<number[]>([]);
  const created = (m: ZoneMap) => navigate(`/zone-maps/${m.id}`);
  const switchTo = (v: How) => {
    setPreview(null);
    setChosen([]);
    setSearch(
      (prev) => {
        const next = new URLSearchParams(prev);
        next.set('how', v);
        return next;
      },
      { replace: true },
    );
  };

  const header = (
    <PageHeader
      title={`New zone map for ${field.name}`}
      crumbs={[
        { label: 'Fields', to: '/fields' },
        { label: field.name, to: `/fields/${field.id}` },
        { label: 'New zone map' },
      ]}
      description="A zone map splits the field into management zones for one crop season. Zones are cut to the boundary; areas are measured on the WGS84 ellipsoid."
    />
  );
  if (!field.boundary) {
    return (
      <>
        {header}
        <EmptyState
          title="This field has no boundary yet"
          action={
            <ButtonLink variant="primary" to={`/fields/${field.id}/boundary`}>
              Bring in a boundary
            </ButtonLink>
          }
        >
          Zones are drawn inside the boundary, so the field needs one first.
        </EmptyState>
      </>
    );
  }
  return (
    <>
      {header}
      <Section title="For which season" className="mt-0">
        <ZoneMapBasicsFields seasons={options} value={basics} onChange={setBasics} />
        {seasons.isSuccess && options.length === 0 ? (
          <p className="mt-2 text-sm">
            <Link
              className="text-clay-700 underline"
              to={`/seasons/new?growerId=${field.growerId}&fieldId=${field.id}`}
            >
              Add a crop season to {field.name}
            </Link>
          </p>
        ) : null}
      </Section>
      <Section title="How to make the zones">
        <Segmented<How> label="How to make the zones" value={how} options={HOW} onChange={switchTo} />
        <div className="mt-4 space-y-5">
          {how === 'default' ? (
            <CreateDefaultZoneMap fieldId={field.id} basics={basics} onCreated={created} />
          ) : null}
          {how === 'file' ? (
            <>
              <ImportStep
                purpose="zones"
                fieldId={field.id}
                preview={preview}
                onReady={(p) => {
                  setPreview(p);
                  setChosen(p ? p.features.filter((f) => f.validity.valid).map((f) => f.index) : []);
                }}
              />
              {preview && preview.features.length === 0 ? (
                <Notice tone="caution" title="No polygons in this file">
                  Zones are polygons; this file has none that Sowright could read. Choose another file.
                </Notice>
              ) : null}
              {preview && preview.features.length > 0 ? (
                <>
                  <FeaturePicker
                    preview={preview}
                    system={system}
                    chosen={chosen}
                    onChange={setChosen}
                    context={field.boundary}
                  />
                  <ZonesFromImportForm
                    preview={preview}
                    chosen={chosen}
                    fieldId={field.id}
                    fieldAreaM2={field.areaM2}
                    basics={basics}
                    onCreated={created}
                  />
                </>
              ) : null}
            </>
          ) : null}
          {how === 'data' ? (
            <>
              <ImportStep purpose="points" fieldId={field.id} preview={preview} onReady={setPreview} />
              {preview ? (
                <ZonesFromDataForm
                  preview={preview}
                  fieldId={field.id}
                  basics={basics}
                  boundary={field.boundary}
                  system={system}
                  onCreated={created}
                />
              ) : null}
            </>
          ) : null}
        </div>
      </Section>
    </>
  );
}

export function Component() {
  const [search] = useSearchParams();
  const fieldId = search.get('fieldId') ?? '';
  const field = useField(fieldId);
  if (!canEditRegister(useViewer())) return <NotAllowed what="making zone maps" />;
  if (!fieldId) {
    return (
      <EmptyState title="Which field?" action={<ButtonLink to="/fields">Choose a field</ButtonLink>}>
        A zone map belongs to a field: open the field and make it from there.
      </EmptyState>
    );
  }
  return (
    <QueryState query={field}>
      {(f) => <NewZoneMap field={f} initialSeasonId={search.get('seasonId') ?? ''} />}
    </QueryState>
  );
}
