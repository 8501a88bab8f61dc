import type { ZoneMap } from '@shared/schemas/zone-map.schema';
import type { UnitSystem } from '@shared/units';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { formatArea } from '@/lib/format';

/** Zones that overlap, each pair with its shared area, and (for editors) which of the two keeps it. */
export function OverlapList({
  map,
  system,
  canEdit,
  busy,
  onKeep,
}: {
  map: ZoneMap;
  system: UnitSystem;
  canEdit: boolean;
  busy: boolean;
  onKeep: (keepZoneId: string, loseZoneId: string) => void;
}) {
  const { overlaps } = map.analysis;
  if (overlaps.length === 0) return null;
  const name = (id: string) =>
    map.zones.features.find((f) => f.properties.id === id)?.properties.name ?? 'a zone';
  return (
    <Notice
      tone="caution"
      title={overlaps.length === 1 ? 'Two zones overlap' : `${overlaps.length} overlaps between zones`}
    >
      <p>
        A place can be in one zone only.{' '}
        {canEdit
          ? 'Choose which zone keeps each overlap (hatched on the map).'
          : 'They are hatched on the map.'}
      </p>
      <ul className="mt-2 space-y-2">
        {overlaps.map((o) => (
          <li key={`${o.aId}-${o.bId}`} className="text-ink">
            <span className="font-medium">{name(o.aId)}</span> and{' '}
            <span className="font-medium">{name(o.bId)}</span> share{' '}
            <span className="font-mono">{formatArea(o.areaM2, system)}</span>.
            {canEdit ? (
              <span className="mt-1 flex flex-wrap gap-2">
                <Button size="sm" disabled={busy} onClick={() => onKeep(o.aId, o.bId)}>
                  {name(o.aId)} keeps it
                </Button>
                <Button size="sm" disabled={busy} onClick={() => onKeep(o.bId, o.aId)}>
                  {name(o.bId)} keeps it
                </Button>
              </span>
            ) : null}
          </li>
        ))}
      </ul>
    </Notice>
  );
}
