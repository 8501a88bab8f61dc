import { useMemo } from 'react';
import type { MultiPolygon } from 'geojson';
import type { ZoneCheck } from '@shared/schemas/prescription.schema';
import type { RateUnit } from '@shared/rates/rate-units';
import { RATE_UNIT_DEFS } from '@shared/rates/rate-units';
import type { UnitSystem } from '@shared/units';
import { MapLegend, type LegendEntry } from '@/components/map/legend';
import { MapFrame } from '@/components/map/map-frame';
import { INK } from '@/components/map/map-style';
import type { MapArea, MapLine } from '@/components/map/map-types';
import { formatArea } from '@/lib/format';
import { rampColour } from '@/components/map/ramp';
import { rateFigures } from './rate-values';

export type MapZone = {
  id: string;
  name: string;
  geometry: MultiPolygon;
  areaM2: number;
  rateSi: number;
  check: ZoneCheck | undefined;
};

/** Colours rates on the cividis ramp between the lowest and highest rate, so a colour keeps its meaning while rates change. */
export function rateColouring(lowSi: number, highSi: number) {
  const span = highSi - lowSi;
  return (si: number) => rampColour(span > 0 ? (si - lowSi) / span : 0.5);
}

const CHECK_WORDS = {
  ok: 'Deliverable',
  warning: 'Outside the limits at the low or high speed',
  flagged: 'Cannot be delivered at the planned speed',
};

/**
 * The prescription's zones coloured by their target rate, the field's boundary, zones the planter check
 * flags outlined with a dashed line, and the chosen zone outlined solid.
 */
export function RateMap({
  label,
  boundary,
  zones,
  unit,
  lowSi,
  highSi,
  selectedId,
  onSelect,
  system,
  fitKey,
}: {
  label: string;
  boundary: MultiPolygon;
  zones: MapZone[];
  unit: RateUnit;
  lowSi: number;
  highSi: number;
  selectedId: string | null;
  onSelect: (id: string) => void;
  system: UnitSystem;
  fitKey: string;
}) {
  const colourOf = useMemo(() => rateColouring(lowSi, highSi), [lowSi, highSi]);
  const areas = useMemo<MapArea[]>(
    () => zones.map((z) => ({ id: z.id, geometry: z.geometry, colour: colourOf(z.rateSi), style: 'zone' })),
    [zones, colourOf],
  );
  const lines = useMemo<MapLine[]>(
    () =>
      zones
        .filter((z) => z.check?.status === 'flagged')
        .map((z) => ({ id: `flag-${z.id}`, geometry: z.geometry, style: 'draft' })),
    [zones],
  );
  const selected = useMemo(() => (selectedId ? [selectedId] : []), [selectedId]);

  const distinct = [...new Set(zones.map((z) => z.rateSi))].sort((a, b) => a - b);
  // A few steps of the ramp when many rates differ; each rate when there are few.
  const shown =
    distinct.length <= 7
      ? distinct
      : Array.from({ length: 5 }, (_, i) => distinct[Math.round((i * (distinct.length - 1)) / 4)]);
  const entries: LegendEntry[] = [
    ...shown.map((si) => ({ key: `r${si}`, colour: colourOf(si), label: rateFigures(si, unit) })),
    ...(lines.length
      ? [
          {
            key: 'flagged',
            colour: INK.accent,
            outline: 'dashed' as const,
            label: 'Flagged by the planter check',
          },
        ]
      : []),
    { key: 'boundary', colour: INK.ink, outline: 'ink' as const, label: 'Field boundary' },
  ];

  const describe = (id: string) => {
    const z = zones.find((x) => x.id === id);
    if (!z) return null;
    return (
      <>
        <span className="block font-medium">{z.name}</span>
        <span className="block font-mono">
          {rateFigures(z.rateSi, unit)} {RATE_UNIT_DEFS[unit].label}
        </span>
        <span className="block font-mono text-ink-soft">{formatArea(z.areaM2, system)}</span>
        {z.check ? <span className="block text-ink-soft">{CHECK_WORDS[z.check.status]}</span> : null}
      </>
    );
  };

  return (
    <MapFrame
      label={label}
      unitSystem={system}
      boundary={boundary}
      areas={areas}
      lines={lines}
      selectedIds={selected}
      onAreaClick={(id) => onSelect(id)}
      describeArea={describe}
      fitKey={fitKey}
      className="h-[420px] xl:h-[560px]"
      legend={
        <MapLegend
          title={`Target rate (${RATE_UNIT_DEFS[unit].label})`}
          entries={entries}
          note={
            distinct.length > 7
              ? `${distinct.length} different rates; colours run from dark (low) to light (high).`
              : undefined
          }
        />
      }
    />
  );
}
