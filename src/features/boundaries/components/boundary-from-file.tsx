import { useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import type { Field } from '@shared/schemas/field.schema';
import type { ImportPreview } from '@shared/schemas/import.schema';
import type { UnitSystem } from '@shared/units';
import { ProblemList } from '@/components/form/problem-list';
import { isStaleVersion } from '@/components/form/use-save-errors';
import { Button, ButtonLink } from '@/components/ui/button';
import { Checkbox } from '@/components/ui/input';
import { Notice } from '@/components/ui/notice';
import { formatArea } from '@/lib/format';
import { resourceKeys } from '@/lib/query-keys';
import { useSetBoundary } from '../api/set-boundary';
import { areaChangeWords, placeWords, reasonWords } from '@/lib/geo-words';

/**
 * Saves the chosen features of an import as the field's boundary. When a chosen feature is not a valid
 * polygon, says why and where and what the repair does to the area, and saves only once the repair is
 * accepted; a feature that cannot be repaired has to be left out.
 */
export function BoundaryFromFile({
  field,
  preview,
  chosen,
  system,
  onSaved,
}: {
  field: Field;
  preview: ImportPreview;
  chosen: number[];
  system: UnitSystem;
  onSaved: (f: Field) => void;
}) {
  const qc = useQueryClient();
  const save = useSetBoundary();
  const [accepted, setAccepted] = useState(false);
  const [stale, setStale] = useState(false);
  const picked = preview.features.filter((f) => chosen.includes(f.index));
  const invalid = picked.filter((f) => !f.validity.valid);
  const unrepairable = invalid.filter((f) => !f.repair);
  const areaM2 = picked.reduce((sum, f) => sum + (f.validity.valid ? f.areaM2 : (f.repair?.areaM2 ?? 0)), 0);
  const canSave = picked.length > 0 && unrepairable.length === 0 && (invalid.length === 0 || accepted);

  const submit = () => {
    setStale(false);
    save.mutate(
      {
        fieldId: field.id,
        input: {
          importId: preview.id,
          featureIndexes: chosen,
          repair: invalid.length > 0 && accepted,
          version: field.version,
        },
      },
      {
        onSuccess: onSaved,
        onError: (e) => {
          if (isStaleVersion(e)) {
            setStale(true);
            void qc.invalidateQueries({ queryKey: resourceKeys('fields').detail(field.id) });
          }
        },
      },
    );
  };

  return (
    <div className="space-y-3">
      <p className="text-sm text-ink">
        {picked.length === 0 ? (
          'Choose at least one feature: on the map or in the list.'
        ) : (
          <>
            {picked.length === 1 ? 'One feature' : `${picked.length} features`} chosen,{' '}
            <span className="font-mono font-medium">{formatArea(areaM2, system)}</span>
            {picked.length > 1 ? ' together (where they overlap, the overlap counts once when saved)' : ''}.
            {field.areaM2 != null ? (
              <> This replaces the boundary on file ({formatArea(field.areaM2, system)}).</>
            ) : null}
          </>
        )}
      </p>
      {invalid.length ? (
        <Notice
          tone="caution"
          title={
            invalid.length === 1
              ? 'A chosen feature is not a valid polygon'
              : 'Chosen features are not valid polygons'
          }
        >
          <ul className="space-y-1">
            {invalid.map((f) => (
              <li key={f.index}>
                <span className="font-medium text-ink">Feature {f.index + 1}</span>:{' '}
                {reasonWords(f.validity.reason)}
                {f.validity.location ? ` at ${placeWords(f.validity.location)}` : ''}.{' '}
                {f.repair
                  ? `The repaired outline (dashed on the map) changes the area by ${areaChangeWords(f.repair.areaM2 - f.areaM2, system)}.`
                  : 'It cannot be repaired into a polygon: leave it out, or fix the file.'}
              </li>
            ))}
          </ul>
          {unrepairable.length === 0 ? (
            <Checkbox
              className="mt-2"
              label="Accept the repair"
              checked={accepted}
              onChange={(e) => setAccepted(e.target.checked)}
            />
          ) : null}
        </Notice>
      ) : null}
      {stale ? (
        <Notice tone="caution" title="Someone else changed this field">
          It was saved by another person after you opened it, so the boundary was not saved. The latest field
          is loaded: check it and save again.
        </Notice>
      ) : null}
      {save.isError && !stale ? (
        <Notice tone="danger" title="The boundary was not saved">
          <ProblemList error={save.error} />
        </Notice>
      ) : null}
      <div className="flex flex-wrap gap-2">
        <Button variant="primary" disabled={!canSave} busy={save.isPending} onClick={submit}>
          {invalid.length ? 'Save the repaired boundary' : 'Save the boundary'}
        </Button>
        <ButtonLink to={`/fields/${field.id}`}>Cancel</ButtonLink>
      </div>
    </div>
  );
}
