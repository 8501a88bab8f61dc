import type { QueryClient } from '@tanstack/react-query';
import { Link, useNavigate, useSearchParams, type LoaderFunction } from 'react-router-dom';
import { CROP_LABELS } from '@shared/schemas/crops';
import type { Season } from '@shared/schemas/season.schema';
import { FormField } from '@/components/ui/form-field';
import { Select } from '@/components/ui/input';
import { Loading } from '@/components/ui/loading';
import { NotAllowed } from '@/components/ui/not-allowed';
import { PageHeader } from '@/components/ui/page-header';
import { ErrorNotice } from '@/components/ui/query-state';
import { Section } from '@/components/ui/section';
import { productsQueryOptions, useProducts } from '@/features/prescriptions/api/get-products';
import { NewPrescriptionForm } from '@/features/prescriptions/components/new-prescription-form';
import { fieldsQueryOptions, useFields } from '@/features/register/api/get-fields';
import { usePlanters } from '@/features/register/api/get-planters';
import { seasonsQueryOptions, useSeasons } from '@/features/register/api/get-seasons';
import { useZoneMaps } from '@/features/zones/api/get-zone-maps';
import { canEditRegister } from '@/lib/permissions';
import { useUnitSystem, useViewer } from '@/lib/viewer';

export const loader =
  (qc: QueryClient): LoaderFunction =>
  ({ request }) => {
    const fieldId = new URL(request.url).searchParams.get('fieldId') ?? '';
    void qc.prefetchQuery(fieldsQueryOptions());
    void qc.prefetchQuery(productsQueryOptions());
    if (fieldId) void qc.prefetchQuery(seasonsQueryOptions({ fieldId }));
    return null;
  };

const seasonLabel = (s: Season) => `${s.year} ${CROP_LABELS[s.crop].toLowerCase()}`;

/** The zone maps, planters and products of the chosen season, then the form. */
function ForSeason({ season }: { season: Season }) {
  const system = useUnitSystem();
  const navigate = useNavigate();
  const maps = useZoneMaps({ fieldId: season.fieldId, seasonId: season.id });
  const planters = usePlanters({ growerId: season.growerId });
  const products = useProducts();
  const failed = [maps, planters, products].find((q) => q.isError);
  if (failed) return <ErrorNotice error={failed.error} onRetry={() => void failed.refetch()} />;
  if (!maps.data || !planters.data || !products.data) return <Loading />;
  return (
    <NewPrescriptionForm
      key={season.id}
      season={season}
      zoneMaps={maps.data}
      planters={planters.data}
      products={products.data.filter((p) => !p.archivedAt)}
      system={system}
      onCreated={(p) => navigate(`/prescriptions/${p.id}`)}
    />
  );
}

export function Component() {
  const [search, setSearch] = useSearchParams();
  const fieldId = search.get('fieldId') ?? '';
  const fields = useFields();
  const seasons = useSeasons({ fieldId });
  if (!canEditRegister(useViewer())) return <NotAllowed what="writing prescriptions" />;
  const fieldSeasons = fieldId
    ? (seasons.data ?? []).filter((s) => s.fieldId === fieldId && !s.archivedAt)
    : [];
  // A field with one crop season: that one, unless the address names another.
  const seasonId = search.get('seasonId') || (fieldSeasons.length === 1 ? fieldSeasons[0].id : '');
  const season = fieldSeasons.find((s) => s.id === seasonId);
  const pick = (next: { fieldId: string; seasonId: string }) =>
    setSearch(
      () => {
        const q = new URLSearchParams();
        if (next.fieldId) q.set('fieldId', next.fieldId);
        if (next.seasonId) q.set('seasonId', next.seasonId);
        return q;
      },
      { replace: true },
    );
  const field = fields.data?.find((f) => f.id === fieldId);
  return (
    <>
      <PageHeader
        title="New prescription"
        crumbs={[{ label: 'Prescriptions', to: '/prescriptions' }, { label: 'New' }]}
        description="Rates per management zone for one field's crop season. The draft starts with every zone at the default rate; set the zone rates in the editor that opens next."
      />
      <Section title="Field and crop season" className="mb-5">
        <div className="grid max-w-4xl gap-4 sm:grid-cols-2">
          <FormField label="Field">
            <Select
              value={fieldId}
              disabled={fields.isPending}
              onChange={(e) => pick({ fieldId: e.target.value, seasonId: '' })}
              placeholder={fields.isPending ? 'Loading…' : 'Choose a field'}
              options={(fields.data ?? [])
                .filter((f) => !f.archivedAt || f.id === fieldId)
                .map((f) => ({ value: f.id, label: `${f.name} (${f.farmName}, ${f.growerName})` }))}
            />
          </FormField>
          <FormField
            label="Crop season"
            hint={
              field && seasons.isSuccess && fieldSeasons.length === 0 ? (
                <Link
                  className="text-clay-700 underline"
                  to={`/seasons/new?growerId=${field.growerId}&fieldId=${field.id}`}
                >
                  Add a crop season to {field.name}
                </Link>
              ) : undefined
            }
          >
            <Select
              value={seasonId}
              disabled={!fieldId || seasons.isPending}
              onChange={(e) => pick({ fieldId, seasonId: e.target.value })}
              placeholder={fieldId ? 'Choose a crop season' : 'Choose the field first'}
              options={fieldSeasons.map((s) => ({ value: s.id, label: seasonLabel(s) }))}
            />
          </FormField>
        </div>
        {field && !field.boundary ? (
          <p className="mt-2 text-sm text-caution">
            {field.name} has no boundary yet, so it has no zones.{' '}
            <Link className="underline" to={`/fields/${field.id}/boundary`}>
              Bring in a boundary
            </Link>
          </p>
        ) : null}
      </Section>
      {season ? <ForSeason season={season} /> : null}
      {fields.isError ? <ErrorNotice error={fields.error} onRetry={() => void fields.refetch()} /> : null}
    </>
  );
}
