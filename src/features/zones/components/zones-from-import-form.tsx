import { useState } from 'react';
import type { ImportPreview } from '@shared/schemas/import.schema';
import type { ZoneMap } from '@shared/schemas/zone-map.schema';
import { ProblemList } from '@/components/form/problem-list';
import { Button } from '@/components/ui/button';
import { FormField } from '@/components/ui/form-field';
import { Checkbox, Select } from '@/components/ui/input';
import { Notice } from '@/components/ui/notice';
import { useCreateZoneMapFromImport } from '../api/create-zone-map-from-import';
import { basicsProblem, type ZoneMapBasics } from './zone-map-basics';

const isNumberLike = (v: unknown) =>
  (typeof v === 'number' && Number.isFinite(v)) ||
  (typeof v === 'string' && v.trim() !== '' && Number.isFinite(Number(v)));

/** Property names of the chosen features, and which of them hold a number in every chosen feature. */
function propertiesOf(preview: ImportPreview, chosen: number[]) {
  const features = preview.features.filter((f) => chosen.includes(f.index));
  const names = [...new Set(features.flatMap((f) => Object.keys(f.properties)))];
  const numeric = names.filter(
    (n) =>
      features.every((f) => f.properties[n] == null || isNumberLike(f.properties[n])) &&
      features.some((f) => isNumberLike(f.properties[n])),
  );
  return { names, numeric };
}

const guess = (names: string[], pattern: RegExp) => names.find((n) => pattern.test(n)) ?? '';

/**
 * Zones from the chosen features of a file: which property names a zone, which carries its class and which
 * its productivity index. The zones are cut to the field's boundary on saving.
 */
export function ZonesFromImportForm({
  preview,
  chosen,
  fieldId,
  fieldAreaM2,
  basics,
  onCreated,
}: {
  preview: ImportPreview;
  chosen: number[];
  fieldId: string;
  fieldAreaM2: number | null;
  basics: ZoneMapBasics;
  onCreated: (m: ZoneMap) => void;
}) {
  const { names, numeric } = propertiesOf(
    preview,
    chosen.length ? chosen : preview.features.map((f) => f.index),
  );
  const [nameProperty, setNameProperty] = useState(() => guess(names, /^(name|zone|label)/i));
  const [classProperty, setClassProperty] = useState(() => guess(numeric, /class|zone/i));
  const [indexProperty, setIndexProperty] = useState(() => guess(numeric, /index|prod|pi$/i));
  // Offered ticked when the chosen features leave more than 1 % of the field uncovered (not for slivers).
  const chosenM2 = preview.features
    .filter((f) => chosen.includes(f.index))
    .reduce((sum, f) => sum + (f.repair?.areaM2 ?? f.areaM2), 0);
  const [fillTouched, setFillGaps] = useState<boolean | null>(null);
  const fillGaps = fillTouched ?? (fieldAreaM2 != null && fieldAreaM2 - chosenM2 > 0.01 * fieldAreaM2);
  const [problem, setProblem] = useState<string | null>(null);
  const create = useCreateZoneMapFromImport();
  const invalid = preview.features.filter((f) => chosen.includes(f.index) && !f.validity.valid);

  const submit = () => {
    const missing =
      basicsProblem(basics) ??
      (chosen.length === 0 ? 'Choose at least one feature: on the map or in the list.' : null);
    setProblem(missing);
    if (missing) return;
    create.mutate(
      {
        importId: preview.id,
        fieldId,
        seasonId: basics.seasonId,
        name: basics.name,
        featureIndexes: chosen,
        nameProperty: nameProperty || null,
        classProperty: classProperty || null,
        indexProperty: indexProperty || null,
        fillGaps,
      },
      { onSuccess: onCreated },
    );
  };

  const none = { value: '', label: '(none)' };
  return (
    <div className="space-y-3">
      <div className="grid max-w-3xl gap-3 sm:grid-cols-3">
        <FormField label="Names the zone" hint="Otherwise Zone 1, Zone 2…">
          <Select
            value={nameProperty}
            onChange={(e) => setNameProperty(e.target.value)}
            options={[none, ...names.map((n) => ({ value: n, label: n }))]}
          />
        </FormField>
        <FormField label="Carries the class" hint="A whole number, 0–254">
          <Select
            value={classProperty}
            onChange={(e) => setClassProperty(e.target.value)}
            options={[none, ...numeric.map((n) => ({ value: n, label: n }))]}
          />
        </FormField>
        <FormField label="Carries the productivity index" hint="0–10">
          <Select
            value={indexProperty}
            onChange={(e) => setIndexProperty(e.target.value)}
            options={[none, ...numeric.map((n) => ({ value: n, label: n }))]}
          />
        </FormField>
      </div>
      <Checkbox
        label="Cover what the zones leave of the field with a default zone"
        checked={fillGaps}
        onChange={(e) => setFillGaps(e.target.checked)}
      />
      {invalid.length ? (
        <Notice tone="caution" title="Some chosen features are not valid polygons">
          {invalid.map((f) => `Feature ${f.index + 1}`).join(', ')}: they are stored as their repaired outline
          (dashed on the map), or the zone map is refused if one cannot be repaired. Leave them out to avoid
          that.
        </Notice>
      ) : null}
      {problem ? <Notice tone="danger">{problem}</Notice> : null}
      {create.isError ? (
        <Notice tone="danger" title="The zone map was not created">
          <ProblemList error={create.error} />
        </Notice>
      ) : null}
      <Button variant="primary" busy={create.isPending} onClick={submit}>
        Create the zone map
      </Button>
    </div>
  );
}
