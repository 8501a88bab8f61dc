import { useMemo } from 'react';
import type { ImportPreview, PreviewFeature } from '@shared/schemas/import.schema';
import type { MultiPolygonGeometry } from '@shared/schemas/geojson.schema';
import type { UnitSystem } from '@shared/units';
import { MapLegend } from '@/components/map/legend';
import { MapFrame } from '@/components/map/map-frame';
import type { MapArea, MapLine, MapMarker } from '@/components/map/map-types';
import { INK } from '@/components/map/map-style';
import { Badge } from '@/components/ui/badge';
import { formatArea } from '@/lib/format';
import { areaChangeWords, featureLabel, placeWords, reasonWords } from '@/lib/geo-words';

const COLOUR = { chosen: '#b8582f', candidate: '#7b8491', invalid: INK.cautionFill };

/**
 * Every polygon feature of an imported file, on the map and in a list, each with its area and whether it
 * is a valid polygon. An invalid one is hatched, its problem place marked, and its repaired outline drawn
 * dashed. Clicking a feature (on the map or in the list) chooses it or leaves it out.
 */
export function FeaturePicker({
  preview,
  system,
  chosen,
  onChange,
  single = false,
  context,
}: {
  preview: ImportPreview;
  system: UnitSystem;
  chosen: number[];
  onChange: (indexes: number[]) => void;
  /** Only one feature at a time (otherwise any number). */
  single?: boolean;
  /** The field's boundary, drawn for context. */
  context?: MultiPolygonGeometry | null;
}) {
  const byId = useMemo(() => new Map(preview.features.map((f) => [String(f.index), f])), [preview]);
  const areas = useMemo<MapArea[]>(
    () =>
      preview.features.map((f) => ({
        id: String(f.index),
        geometry: f.geometry,
        colour: f.validity.valid
          ? chosen.includes(f.index)
            ? COLOUR.chosen
            : COLOUR.candidate
          : COLOUR.invalid,
        style: f.validity.valid ? (chosen.includes(f.index) ? 'chosen' : 'candidate') : 'invalid',
      })),
    [preview, chosen],
  );
  const lines = useMemo<MapLine[]>(
    () =>
      preview.features.flatMap((f) =>
        f.repair ? [{ id: `repair-${f.index}`, geometry: f.repair.geometry, style: 'repair' as const }] : [],
      ),
    [preview],
  );
  const markers = useMemo<MapMarker[]>(
    () =>
      preview.features.flatMap((f) =>
        f.validity.location && f.validity.location.length >= 2
          ? [
              {
                id: `at-${f.index}`,
                position: [f.validity.location[0], f.validity.location[1]] as [number, number],
              },
            ]
          : [],
      ),
    [preview],
  );
  const toggle = (index: number) => {
    if (single) onChange(chosen.includes(index) ? [] : [index]);
    else
      onChange(
        chosen.includes(index) ? chosen.filter((i) => i !== index) : [...chosen, index].sort((a, b) => a - b),
      );
  };
  const anyInvalid = preview.features.some((f) => !f.validity.valid);

  return (
    <div className="grid gap-4 lg:grid-cols-[minmax(0,3fr)_minmax(18rem,2fr)]">
      <MapFrame
        label={`The features of ${preview.fileName}`}
        unitSystem={system}
        boundary={context}
        areas={areas}
        lines={lines}
        markers={markers}
        selectedIds={chosen.map(String)}
        onAreaClick={(id) => toggle(Number(id))}
        describeArea={(id) => {
          const f = byId.get(id);
          return f ? <FeatureWords f={f} system={system} /> : null;
        }}
        fitKey={preview.id + (preview.coordinates.kind === 'geographic' ? preview.coordinates.source : '')}
        legend={
          <MapLegend
            title="In the file"
            entries={[
              { key: 'chosen', colour: COLOUR.chosen, label: 'Chosen' },
              { key: 'other', colour: COLOUR.candidate, label: 'Not chosen' },
              ...(anyInvalid
                ? [
                    { key: 'invalid', colour: INK.caution, hatch: true, label: 'Not a valid polygon' },
                    {
                      key: 'repair',
                      colour: INK.repair,
                      outline: 'dashed' as const,
                      label: 'Repaired outline',
                    },
                  ]
                : []),
              ...(context
                ? [{ key: 'boundary', colour: INK.ink, outline: 'ink' as const, label: 'Field boundary now' }]
                : []),
            ]}
            note="Click a feature to choose it."
          />
        }
      />
      <fieldset className="min-w-0">
        <legend className="mb-1 text-sm font-medium text-ink">
          {single ? 'Choose the feature' : 'Choose the features'}
        </legend>
        <ul className="max-h-[460px] divide-y divide-ink-line overflow-y-auto rounded-card border border-ink-line bg-paper-raised">
          {preview.features.map((f) => (
            <li key={f.index} className={`px-3 py-2 text-sm ${chosen.includes(f.index) ? 'bg-clay-50' : ''}`}>
              <label className="flex cursor-pointer items-start gap-2">
                <input
                  type={single ? 'radio' : 'checkbox'}
                  name="feature"
                  className="mt-1 size-4 accent-clay-600"
                  checked={chosen.includes(f.index)}
                  onChange={() => toggle(f.index)}
                />
                <span className="min-w-0 flex-1">
                  <FeatureWords f={f} system={system} />
                </span>
              </label>
            </li>
          ))}
        </ul>
      </fieldset>
    </div>
  );
}

function FeatureWords({ f, system }: { f: PreviewFeature; system: UnitSystem }) {
  return (
    <span className="block">
      <span className="flex flex-wrap items-center justify-between gap-x-2">
        <span className="font-medium text-ink">{featureLabel(f)}</span>
        <span className="font-mono text-ink tabular-nums">{formatArea(f.areaM2, system)}</span>
      </span>
      {f.layer ? <span className="block text-xs text-ink-soft">Layer {f.layer}</span> : null}
      <span className="mt-0.5 flex flex-wrap items-center gap-1.5">
        {f.validity.valid ? (
          <Badge tone="ok">Valid</Badge>
        ) : (
          <Badge tone="caution">Not valid: {reasonWords(f.validity.reason)}</Badge>
        )}
        {f.geometry.coordinates.length > 1 ? <Badge>{f.geometry.coordinates.length} parts</Badge> : null}
      </span>
      {!f.validity.valid ? (
        <span className="mt-0.5 block text-xs text-ink-soft">
          {f.validity.location ? <>At {placeWords(f.validity.location)}. </> : null}
          {f.repair ? (
            <>Repair changes the area by {areaChangeWords(f.repair.areaM2 - f.areaM2, system)}.</>
          ) : (
            <>It cannot be repaired into a polygon.</>
          )}
        </span>
      ) : null}
    </span>
  );
}
