import { useMemo, useState } from 'react';
import type { UseMutationResult } from '@tanstack/react-query';
import type { ZoneMap } from '@shared/schemas/zone-map.schema';
import type { UnitSystem } from '@shared/units';
import { MapLegend } from '@/components/map/legend';
import { MapFrame } from '@/components/map/map-frame';
import { INK } from '@/components/map/map-style';
import type { AreaGeometry, DrawRequest, MapArea, MapLine } from '@/components/map/map-types';
import { ProblemList } from '@/components/form/problem-list';
import { isStaleVersion } from '@/components/form/use-save-errors';
import { Button } from '@/components/ui/button';
import { ConfirmDialog } from '@/components/ui/dialog';
import { Notice } from '@/components/ui/notice';
import { formatArea } from '@/lib/format';
import { useAddZone } from '../api/add-zone';
import { useDeleteZone } from '../api/delete-zone';
import { useFillGaps } from '../api/fill-gaps';
import { useMergeZones } from '../api/merge-zones';
import { useResolveOverlap } from '../api/resolve-overlap';
import { useSplitZone } from '../api/split-zone';
import { useUpdateZone } from '../api/update-zone';
import { OverlapList } from './overlap-list';
import { SLIVER_M2 } from './slivers';
import { zoneColouring } from './zone-colours';
import { ZonePanel } from './zone-panel';
import { ZoneTable } from './zone-table';

type Tool = 'none' | 'draw' | 'split' | 'corners';

/** A name not yet taken: "Zone 4", "Zone 5"… */
const nextZoneName = (map: ZoneMap) => {
  const taken = new Set(map.zones.features.map((f) => f.properties.name));
  let n = map.zones.features.length + 1;
  while (taken.has(`Zone ${n}`)) n += 1;
  return `Zone ${n}`;
};

/**
 * A zone map on the map and in a table. Everyone may look (hover, click for details); those who may edit
 * also draw, split, merge, reshape, delete and rename zones, settle overlaps and fill gaps. Each edit carries
 * the map's version; when someone else changed it first the latest is loaded and the user told.
 */
export function ZoneMapEditor({
  map,
  system,
  canEdit,
}: {
  map: ZoneMap;
  system: UnitSystem;
  canEdit: boolean;
}) {
  const zones = useMemo(() => map.zones.features.map((f) => f.properties), [map]);
  const colouring = useMemo(() => zoneColouring(zones), [zones]);
  const [picked, setPicked] = useState<string[]>([]);
  const selected = picked.filter((id) => zones.some((z) => z.id === id));
  const [tool, setTool] = useState<Tool>('none');
  const [outline, setOutline] = useState<AreaGeometry | null>(null);
  const [problem, setProblem] = useState<unknown>(null);
  const [stale, setStale] = useState(false);
  const [confirmDelete, setConfirmDelete] = useState(false);

  const add = useAddZone(map.id);
  const update = useUpdateZone(map.id);
  const remove = useDeleteZone(map.id);
  const split = useSplitZone(map.id);
  const merge = useMergeZones(map.id);
  const resolve = useResolveOverlap(map.id);
  const fill = useFillGaps(map.id);
  const busy = [add, update, remove, split, merge, resolve, fill].some((m) => m.isPending);

  const one = selected.length === 1 ? zones.find((z) => z.id === selected[0]) : undefined;
  const oneGeometry = one ? map.zones.features.find((f) => f.properties.id === one.id)?.geometry : undefined;

  /** Runs one edit; afterwards selects what `select` picks from the answer. */
  function run<V>(m: UseMutationResult<ZoneMap, Error, V>, vars: V, select?: (next: ZoneMap) => string[]) {
    setProblem(null);
    setStale(false);
    m.mutate(vars, {
      onSuccess: (next) => {
        setTool('none');
        setOutline(null);
        setConfirmDelete(false);
        if (select) setPicked(select(next));
      },
      onError: (e) => {
        setConfirmDelete(false);
        if (isStaleVersion(e)) {
          setStale(true);
          setTool('none');
          setOutline(null);
        } else setProblem(e);
      },
    });
  }
  const newIds = (next: ZoneMap) =>
    next.zones.features.map((f) => f.properties.id).filter((id) => !zones.some((z) => z.id === id));

  const choose = (id: string, addToChoice: boolean) => {
    if (tool !== 'none') return;
    setPicked((prev) => {
      const current = prev.filter((x) => zones.some((z) => z.id === x));
      if (addToChoice)
        return current.includes(id) ? current.filter((x) => x !== id) : [...current, id].slice(-2);
      return current.length === 1 && current[0] === id ? [] : [id];
    });
  };

  const draw: DrawRequest | null =
    tool === 'draw'
      ? {
          mode: 'polygon',
          hint: 'Click to place the corners of the new zone; click the first corner again, or press Finish. It is cut to the boundary.',
          onDone: (geometry) => {
            setTool('none');
            run(
              add,
              {
                mapId: map.id,
                input: {
                  version: map.version,
                  name: nextZoneName(map),
                  geometry,
                  classValue: null,
                  productivityIndex: null,
                },
              },
              newIds,
            );
          },
          onCancel: () => setTool('none'),
        }
      : tool === 'split' && one
        ? {
            mode: 'line',
            hint: `Draw a line right across ${one.name}: click to place points, then click the last point again, or press Finish.`,
            onDone: (line) => {
              setTool('none');
              run(split, { mapId: map.id, input: { version: map.version, zoneId: one.id, line } }, (next) => [
                one.id,
                ...newIds(next),
              ]);
            },
            onCancel: () => setTool('none'),
          }
        : tool === 'corners' && outline
          ? {
              mode: 'edit',
              geometry: outline,
              onChange: setOutline,
              hint: 'Drag a corner to move it, a midpoint to add one; select a corner and press Delete to remove it. Holes and parts are kept.',
            }
          : null;

  const areas = useMemo<MapArea[]>(
    () =>
      map.zones.features
        .filter((f) => !(tool === 'corners' && f.properties.id === one?.id))
        .map((f) => ({
          id: f.properties.id,
          geometry: f.geometry,
          colour: colouring.colourOf(f.properties),
          style: 'zone' as const,
        })),
    [map, colouring, tool, one?.id],
  );
  const lines = useMemo<MapLine[]>(
    () =>
      map.analysis.overlaps.map((o) => ({
        id: `overlap-${o.aId}-${o.bId}`,
        geometry: o.geometry,
        style: 'overlap' as const,
      })),
    [map],
  );

  const describe = (id: string) => {
    const z = zones.find((x) => x.id === id);
    if (!z) return null;
    return (
      <>
        <span className="block font-medium">{z.name}</span>
        <span className="block font-mono">{formatArea(z.areaM2, system)}</span>
        <span className="block text-ink-soft">
          Class {z.classValue ?? '—'} · index {z.productivityIndex ?? '—'}
        </span>
      </>
    );
  };

  return (
    <div className="space-y-4">
      {canEdit ? (
        <div role="toolbar" aria-label="Zone tools" className="flex flex-wrap items-center gap-2">
          {tool === 'corners' ? (
            <>
              <Button
                variant="primary"
                busy={update.isPending}
                onClick={() =>
                  one &&
                  outline &&
                  run(update, {
                    mapId: map.id,
                    zoneId: one.id,
                    input: {
                      version: map.version,
                      name: one.name,
                      classValue: one.classValue,
                      productivityIndex: one.productivityIndex,
                      geometry: outline,
                    },
                  })
                }
              >
                Save the new outline
              </Button>
              <Button
                onClick={() => {
                  setTool('none');
                  setOutline(null);
                }}
              >
                Cancel
              </Button>
            </>
          ) : (
            <>
              <Button
                variant={tool === 'draw' ? 'primary' : 'secondary'}
                disabled={busy || tool !== 'none'}
                onClick={() => setTool('draw')}
              >
                Draw a zone
              </Button>
              <Button
                variant={tool === 'split' ? 'primary' : 'secondary'}
                disabled={busy || tool !== 'none' || !one}
                onClick={() => setTool('split')}
              >
                Split by a line
              </Button>
              <Button
                disabled={busy || tool !== 'none' || !oneGeometry}
                onClick={() => {
                  setOutline(oneGeometry ?? null);
                  setTool('corners');
                }}
              >
                Move corners
              </Button>
              <Button
                disabled={busy || tool !== 'none' || selected.length !== 2}
                onClick={() =>
                  run(
                    merge,
                    {
                      mapId: map.id,
                      input: {
                        version: map.version,
                        zoneIds: [selected[0], selected[1]] as [string, string],
                      },
                    },
                    () => [selected[0]],
                  )
                }
              >
                Merge the two
              </Button>
              <Button disabled={busy || tool !== 'none' || !one} onClick={() => setConfirmDelete(true)}>
                Delete
              </Button>
              {map.analysis.gapAreaM2 >= SLIVER_M2 ? (
                <Button
                  disabled={busy || tool !== 'none'}
                  onClick={() => run(fill, { mapId: map.id, version: map.version })}
                >
                  Fill the gaps with a default zone
                </Button>
              ) : null}
            </>
          )}
          <span className="text-xs text-ink-soft">
            {selected.length === 0
              ? 'Click a zone to choose it; Shift-click a second to merge.'
              : selected.length === 1
                ? `Chosen: ${one?.name}.`
                : `Chosen: ${selected.map((id) => zones.find((z) => z.id === id)?.name).join(' and ')}.`}
          </span>
        </div>
      ) : null}
      {stale ? (
        <Notice tone="caution" title="Someone else changed this zone map">
          It was changed by another person after you opened it, so your last change was not made. The latest
          version is loaded: look it over and make the change again if it is still needed.
        </Notice>
      ) : null}
      {problem ? (
        <Notice tone="danger" title="Not changed">
          <ProblemList error={problem} />
        </Notice>
      ) : null}
      <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_19rem]">
        <MapFrame
          label={`Zones of ${map.fieldName}, ${map.name}`}
          unitSystem={system}
          boundary={map.boundary}
          areas={areas}
          lines={lines}
          selectedIds={selected}
          onAreaClick={(id, opts) => choose(id, opts.add)}
          describeArea={describe}
          draw={draw}
          fitKey={map.id}
          className="h-[540px]"
          legend={
            <MapLegend
              title={colouring.title}
              entries={[
                ...colouring.legend,
                ...(lines.length
                  ? [{ key: 'overlap', colour: INK.danger, hatch: true, label: 'Overlap' }]
                  : []),
                ...(map.analysis.gapAreaM2 >= SLIVER_M2
                  ? [{ key: 'gap', colour: INK.line, label: 'In no zone' }]
                  : []),
                { key: 'boundary', colour: INK.ink, outline: 'ink' as const, label: 'Field boundary' },
              ]}
            />
          }
        />
        <div className="space-y-3">
          {one ? (
            <ZonePanel
              key={`${one.id}-${map.version}`}
              map={map}
              zone={one}
              system={system}
              canEdit={canEdit}
              onStale={() => setStale(true)}
            />
          ) : (
            <p className="rounded-card border border-dashed border-ink-line px-3 py-4 text-sm text-ink-soft">
              Point at a zone to see its name and area; click it for the details
              {canEdit ? ' and to change it' : ''}.
            </p>
          )}
          <OverlapList
            map={map}
            system={system}
            canEdit={canEdit}
            busy={busy}
            onKeep={(keepZoneId, loseZoneId) =>
              run(resolve, { mapId: map.id, input: { version: map.version, keepZoneId, loseZoneId } })
            }
          />
          {map.analysis.gapAreaM2 >= SLIVER_M2 ? (
            <Notice tone="info" title="Part of the field is in no zone">
              {formatArea(map.analysis.gapAreaM2, system)} of the field lies outside every zone.
              {canEdit ? ' "Fill the gaps with a default zone" gives it to the default zone.' : ''}
            </Notice>
          ) : null}
        </div>
      </div>
      <ZoneTable map={map} system={system} colouring={colouring} selectedIds={selected} onSelect={choose} />
      <ConfirmDialog
        open={confirmDelete && !!one}
        title={`Delete ${one?.name ?? 'the zone'}?`}
        confirmLabel="Delete the zone"
        tone="danger"
        busy={remove.isPending}
        onClose={() => setConfirmDelete(false)}
        onConfirm={() =>
          one && run(remove, { mapId: map.id, zoneId: one.id, version: map.version }, () => [])
        }
      >
        <p>
          What it covers becomes a gap in the field, until another zone takes it or the gaps are filled with a
          default zone.
        </p>
      </ConfirmDialog>
    </div>
  );
}
