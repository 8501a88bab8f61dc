import { CROP_LABELS } from '@shared/schemas/crops';
import { RATE_KIND_LABELS, type Product } from '@shared/schemas/product.schema';
import { Facts } from '@/components/ui/facts';
import { Section } from '@/components/ui/section';
import { useUnitSystem } from '@/lib/viewer';
import { KIND_WORDS } from './product-table';
import { priceWords, unitSizeWords } from './product-values';

/** A product as read by someone who may not change it (or while it is archived). */
export function ProductFacts({ product: p }: { product: Product }) {
  const system = useUnitSystem();
  return (
    <>
      <Facts
        columns={3}
        items={[
          { label: 'Kind', value: KIND_WORDS[p.kind] },
          { label: 'Crop', value: p.crop ? CROP_LABELS[p.crop] : '—' },
          { label: 'Rate measured by', value: RATE_KIND_LABELS[p.rateKind] },
          { label: 'Unit size', value: unitSizeWords(p, system), numeric: true },
          { label: 'Price per unit', value: priceWords(p.pricePerUnit, p.currency), numeric: true },
          { label: 'Currency', value: p.currency },
        ]}
      />
      {p.notes ? (
        <Section title="Notes">
          <p className="max-w-3xl text-sm whitespace-pre-line text-ink-soft">{p.notes}</p>
        </Section>
      ) : null}
      {p.kind === 'seed' ? (
        <p className="mt-5 max-w-3xl text-sm text-ink-soft">
          Treated seed is a pesticide: handle, store and plant it as its label directs.
        </p>
      ) : null}
    </>
  );
}
