import { useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import type { Field } from '@shared/schemas/field.schema';
import type { UnitSystem } from '@shared/units';
import { MapLegend } from '@/components/map/legend';
import { MapFrame } from '@/components/map/map-frame';
import { INK } from '@/components/map/map-style';
import type { AreaGeometry, DrawRequest } from '@/components/map/map-types';
import { ProblemList } from '@/components/form/problem-list';
import { isStaleVersion } from '@/components/form/use-save-errors';
import { Button, ButtonLink } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { isApiError } from '@/lib/api-client';
import { resourceKeys } from '@/lib/query-keys';
import { useSetBoundary } from '../api/set-boundary';

type Mode = 'view' | 'drawing' | 'editing';

/**
 * Draws a field's boundary by hand, or moves the corners of the one on file (holes and parts are kept),
 * then saves it. PostGIS judges the outline; when it is not a valid polygon the page is told
 * (`onInvalid`) so it can show the repair and its change of area before anything is stored.
 */
export function BoundaryDrawer({
  field,
  system,
  onSaved,
  onInvalid,
}: {
  field: Field;
  system: UnitSystem;
  onSaved: (f: Field) => void;
  onInvalid: (geometry: AreaGeometry) => void;
}) {
  const qc = useQueryClient();
  const save = useSetBoundary();
  const [mode, setMode] = useState<Mode>('view');
  const [draft, setDraft] = useState<AreaGeometry | null>(null);
  const [stale, setStale] = useState(false);

  const draw: DrawRequest | null =
    mode === 'drawing'
      ? {
          mode: 'polygon',
          onDone: (g) => {
            setDraft(g);
            setMode('view');
          },
          onCancel: () => setMode('view'),
        }
      : mode === 'editing' && (draft ?? field.boundary)
        ? {
            mode: 'edit',
            geometry: (draft ?? field.boundary)!,
            onChange: setDraft,
            hint: 'Drag a corner to move it; drag a midpoint to add one; select a corner and press Delete to remove it.',
          }
        : null;

  const invalid = isApiError(save.error) && save.error.status === 422 ? save.error : null;

  const submit = () => {
    if (!draft) return;
    setStale(false);
    save.mutate(
      { fieldId: field.id, input: { geometry: draft, repair: false, version: field.version } },
      {
        onSuccess: (f) => {
          setDraft(null);
          setMode('view');
          onSaved(f);
        },
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
      <div className="flex flex-wrap items-center gap-2">
        <Button
          variant={mode === 'drawing' ? 'primary' : 'secondary'}
          disabled={mode !== 'view'}
          onClick={() => {
            save.reset();
            setDraft(null);
            setMode('drawing');
          }}
        >
          Draw a new outline
        </Button>
        {field.boundary || draft ? (
          <Button
            variant={mode === 'editing' ? 'primary' : 'secondary'}
            onClick={() => {
              save.reset();
              setMode(mode === 'editing' ? 'view' : 'editing');
            }}
            disabled={mode === 'drawing'}
          >
            {mode === 'editing'
              ? 'Done moving corners'
              : draft
                ? 'Move corners of the new outline'
                : 'Move corners of the boundary on file'}
          </Button>
        ) : null}
      </div>
      <MapFrame
        label={`Boundary of ${field.name}`}
        unitSystem={system}
        boundary={mode === 'editing' ? null : field.boundary}
        areas={
          draft && mode !== 'editing'
            ? [{ id: 'draft', geometry: draft, colour: '#b8582f', style: 'chosen' }]
            : []
        }
        draw={draw}
        fitKey={field.id}
        className="h-[520px]"
        legend={
          <MapLegend
            title="Boundary"
            entries={[
              ...(field.boundary
                ? [{ key: 'on-file', colour: INK.ink, outline: 'ink' as const, label: 'On file' }]
                : []),
              { key: 'draft', colour: '#b8582f', label: 'New outline, not saved' },
            ]}
          />
        }
      />
      {stale ? (
        <Notice tone="caution" title="Someone else changed this field">
          It was saved by another person after you opened it, so your outline was not saved. The latest field
          is loaded; your outline is kept here: save it again if it is still right.
        </Notice>
      ) : null}
      {invalid ? (
        <Notice tone="caution" title="This outline is not a valid polygon">
          <ProblemList error={invalid} />
          <p className="mt-1">
            Nothing was saved. Move the corners to fix it, or see what the repair would store.
          </p>
          {draft ? (
            <Button className="mt-2" size="sm" onClick={() => onInvalid(draft)}>
              See the repair
            </Button>
          ) : null}
        </Notice>
      ) : save.isError && !stale ? (
        <Notice tone="danger" title="The boundary was not saved">
          <ProblemList error={save.error} />
        </Notice>
      ) : null}
      <div className="flex flex-wrap gap-2">
        <Button
          variant="primary"
          disabled={!draft || mode === 'drawing'}
          busy={save.isPending}
          onClick={submit}
        >
          Save this outline
        </Button>
        {draft ? (
          <Button
            onClick={() => {
              setDraft(null);
              setMode('view');
              save.reset();
            }}
          >
            Discard it
          </Button>
        ) : null}
        <ButtonLink to={`/fields/${field.id}`}>Back to the field</ButtonLink>
      </div>
    </div>
  );
}
