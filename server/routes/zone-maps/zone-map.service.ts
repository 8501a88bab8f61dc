import { QueryTypes, literal, type Transaction } from 'sequelize';
import type { z } from 'zod';
import type { MultiPolygon } from 'geojson';
import { CropSeason, Field, Grower } from '../../db/associations';
import { ZoneMap } from '../../db/models/zone-map.model';
import { archivedWhere, assertFound, assertVersion, inScope, iso, scopedWhere } from '../../lib/scope';
import { stripCrs } from '../../lib/geometry';
import { ConflictError, DomainError, NotFoundError, ValidationError } from '../../errors';
import type { Actor } from '../../types';
import { toMultiPolygon } from '../../../shared/geo/to-multipolygon';
import { rewindRfc7946 } from '../../../shared/geo/rewind';
import { GeoInputError } from '../../../shared/geo/geo-input-error';
import {
  clipToBoundary,
  fillGaps as fillGapsGeo,
  mergeZones,
  resolveOverlap as resolveOverlapGeo,
  splitZone,
} from '../../../shared/geo/zone-ops';
import { CROP_LABELS } from '../../../shared/schemas/crops';
import type {
  ZoneMap as ZoneMapDto,
  addZoneSchema,
  createZoneMapSchema,
  mergeZonesSchema,
  newZoneMapVersionSchema,
  resolveOverlapSchema,
  splitZoneSchema,
  updateZoneSchema,
  zoneMapListQuerySchema,
} from '../../../shared/schemas/zone-map.schema';
import {
  analyse,
  assertValidInput,
  copyZones,
  deleteZoneRow,
  insertZone,
  toGeoFeature,
  updateZoneRow,
  zoneRowsOf,
  type ZoneInput,
  type ZoneRow,
} from './zone-store';

const include = [
  { model: Field, as: 'field', attributes: ['id', 'name', 'boundary', 'areaM2'] },
  { model: CropSeason, as: 'season', attributes: ['id', 'year', 'crop'] },
  { model: Grower, as: 'grower', attributes: ['id', 'name'] },
];

/** The default zone's name: what no other zone covers. */
export const DEFAULT_ZONE_NAME = 'Rest of field';
const ZONE_NAME_MAX = 60;

const seasonLabel = (s: CropSeason | undefined) => (s ? `${s.year} ${CROP_LABELS[s.crop] ?? s.crop}` : '');

/** Finds a zone map in the actor's scope (404 otherwise), with its field, season and grower. */
export async function findZoneMap(actor: Actor, id: string, t?: Transaction) {
  const map = await ZoneMap.findOne({ where: scopedWhere(actor, { id }), include, transaction: t });
  return assertFound(map, 'Zone map');
}

function boundaryOf(map: ZoneMap): MultiPolygon {
  const boundary = map.field?.boundary;
  if (!boundary) {
    throw new ConflictError(
      'The field has no boundary any more: set its boundary before editing zones',
      'conflict',
      [{ path: ['fieldId'], message: 'The field has no boundary' }],
    );
  }
  return stripCrs(boundary) as MultiPolygon;
}

async function toDto(map: ZoneMap, zones?: ZoneRow[]): Promise<ZoneMapDto> {
  const rows = zones ?? (await zoneRowsOf(map.id));
  return {
    id: map.id,
    fieldId: map.fieldId,
    fieldName: map.field?.name ?? '',
    seasonId: map.cropSeasonId,
    seasonLabel: seasonLabel(map.season),
    growerId: map.growerId,
    name: map.name,
    versionNo: map.versionNo,
    source: map.source,
    sourceNote: map.sourceNote,
    version: map.version,
    boundary: rewindRfc7946(boundaryOf(map)),
    zones: {
      type: 'FeatureCollection',
      features: rows.map((z) => {
        const f = toGeoFeature(z);
        return { ...f, id: z.id, properties: { ...f.properties, areaM2: z.areaM2, meanValue: z.meanValue } };
      }),
    },
    analysis: await analyse(map.id, map.fieldId),
    archivedAt: iso(map.archivedAt),
    updatedAt: map.updatedAt.toISOString(),
  };
}

export async function getZoneMap(actor: Actor, id: string): Promise<ZoneMapDto> {
  return toDto(await findZoneMap(actor, id));
}

export async function listZoneMaps(actor: Actor, q: z.output<typeof zoneMapListQuerySchema>) {
  const rows = await ZoneMap.findAll({
    where: scopedWhere(actor, {
      ...archivedWhere(q.archived),
      ...(q.fieldId ? { fieldId: q.fieldId } : {}),
      ...(q.seasonId ? { cropSeasonId: q.seasonId } : {}),
    }),
    include,
    attributes: {
      include: [
        [literal('(SELECT count(*) FROM zones z WHERE z.zone_map_id = "ZoneMap"."id")'), 'zoneCount'],
      ],
    },
    order: [
      ['updatedAt', 'DESC'],
      ['versionNo', 'DESC'],
    ],
  });
  return {
    items: rows.map((m) => ({
      id: m.id,
      fieldId: m.fieldId,
      fieldName: m.field?.name ?? '',
      seasonId: m.cropSeasonId,
      seasonLabel: seasonLabel(m.season),
      growerId: m.growerId,
      name: m.name,
      versionNo: m.versionNo,
      source: m.source,
      version: m.version,
      archivedAt: iso(m.archivedAt),
      updatedAt: m.updatedAt.toISOString(),
      zoneCount: Number(m.get('zoneCount' as never)),
    })),
  };
}

/**
 * The field and season of a new zone map, both in the actor's scope, the season of that field, and the
 * field's boundary (a zone map needs one).
 */
async function fieldAndSeason(actor: Actor, fieldId: string, seasonId: string, t: Transaction) {
  const field = await Field.findByPk(fieldId, { transaction: t });
  if (!field || !inScope(actor, field.workspaceId, field.growerId)) throw new NotFoundError('Field');
  // The season row is locked so two new maps of one (field, season) take their version numbers in turn.
  const season = await CropSeason.findByPk(seasonId, { transaction: t, lock: t.LOCK.UPDATE });
  if (!season || !inScope(actor, season.workspaceId, season.growerId)) throw new NotFoundError('Crop season');
  if (season.fieldId !== field.id) {
    throw new ValidationError('This crop season belongs to another field', [
      { path: ['seasonId'], message: 'This crop season belongs to another field' },
    ]);
  }
  if (!field.boundary) {
    const message = `The field "${field.name}" has no boundary yet: set its boundary first, then make zones`;
    throw new ConflictError(message, 'conflict', [{ path: ['fieldId'], message }]);
  }
  return { field, season, boundary: stripCrs(field.boundary) as MultiPolygon };
}

async function nextVersionNo(fieldId: string, seasonId: string, t: Transaction): Promise<number> {
  const [row] = await ZoneMap.sequelize!.query<{ next: number }>(
    'SELECT COALESCE(max(version_no), 0) + 1 AS next FROM zone_maps WHERE field_id = :fieldId AND crop_season_id = :seasonId',
    { replacements: { fieldId, seasonId }, type: QueryTypes.SELECT, transaction: t },
  );
  return row.next;
}

type NewMap = {
  fieldId: string;
  seasonId: string;
  name: string;
  source: ZoneMap['source'];
  sourceNote: string | null;
};

/**
 * Creates a zone map in one transaction: `zonesOf` gives the zones from the field's boundary; nothing is
 * kept if any of them fails.
 */
export async function createZoneMapWith(
  actor: Actor,
  input: NewMap,
  zonesOf: (boundary: MultiPolygon) => Promise<ZoneInput[]> | ZoneInput[],
): Promise<ZoneMapDto> {
  const id = await ZoneMap.sequelize!.transaction(async (t) => {
    const { field, season, boundary } = await fieldAndSeason(actor, input.fieldId, input.seasonId, t);
    const zones = await zonesOf(boundary);
    const map = await ZoneMap.create(
      {
        workspaceId: actor.workspaceId,
        growerId: field.growerId,
        fieldId: field.id,
        cropSeasonId: season.id,
        name: input.name,
        versionNo: await nextVersionNo(field.id, season.id, t),
        source: input.source,
        sourceNote: input.sourceNote,
        createdBy: actor.userId,
      },
      { transaction: t },
    );
    for (const [i, zone] of zones.entries()) await insertZone(t, map, { ...zone, sortOrder: i });
    return map.id;
  });
  return getZoneMap(actor, id);
}

/** The one default zone that covers the whole boundary. */
export const defaultZone = (geometry: MultiPolygon): ZoneInput => ({
  name: DEFAULT_ZONE_NAME,
  classValue: null,
  productivityIndex: null,
  isDefault: true,
  meanValue: null,
  geometry,
});

export function createZoneMap(actor: Actor, input: z.output<typeof createZoneMapSchema>) {
  return createZoneMapWith(actor, { ...input, source: 'drawn', sourceNote: null }, (boundary) => [
    defaultZone(boundary),
  ]);
}

export async function newVersion(actor: Actor, id: string, input: z.output<typeof newZoneMapVersionSchema>) {
  const newId = await ZoneMap.sequelize!.transaction(async (t) => {
    const from = await findZoneMap(actor, id, t);
    const { field, season } = await fieldAndSeason(actor, from.fieldId, from.cropSeasonId, t);
    const map = await ZoneMap.create(
      {
        workspaceId: from.workspaceId,
        growerId: from.growerId,
        fieldId: field.id,
        cropSeasonId: season.id,
        name: input.name ?? from.name,
        versionNo: await nextVersionNo(field.id, season.id, t),
        source: from.source,
        sourceNote: from.sourceNote,
        createdBy: actor.userId,
      },
      { transaction: t },
    );
    await copyZones(t, from.id, map.id);
    return map.id;
  });
  return getZoneMap(actor, newId);
}

type EditContext = { t: Transaction; map: ZoneMap; zones: ZoneRow[]; boundary: MultiPolygon };

/**
 * One edit: in one transaction, with the zone map row locked, its `version` checked (409 `stale`) and
 * raised; answers the whole zone map as it now is.
 */
async function edit(actor: Actor, id: string, version: number, fn: (ctx: EditContext) => Promise<void>) {
  await ZoneMap.sequelize!.transaction(async (t) => {
    const locked = await ZoneMap.findOne({
      where: scopedWhere(actor, { id }),
      transaction: t,
      lock: t.LOCK.UPDATE,
    });
    assertFound(locked, 'Zone map');
    const map = await findZoneMap(actor, id, t);
    assertVersion(map.version, version);
    if (map.archivedAt) {
      throw new ConflictError('This zone map is archived: restore it before editing its zones');
    }
    await fn({ t, map, zones: await zoneRowsOf(map.id, t), boundary: boundaryOf(map) });
    await ZoneMap.sequelize!.query(
      'UPDATE zone_maps SET version = version + 1, updated_at = now() WHERE id = :id',
      {
        replacements: { id },
        transaction: t,
      },
    );
  });
  return getZoneMap(actor, id);
}

function zoneIn(zones: ZoneRow[], zoneId: string, path = 'zoneId'): ZoneRow {
  const zone = zones.find((z) => z.id === zoneId);
  if (!zone) {
    throw new DomainError('not_found', 'Zone not found in this zone map', [
      { path: [path], message: 'Not a zone of this map' },
    ]);
  }
  return zone;
}

/**
 * A shared/geo refusal (a line that does not cross a zone, say) is the user's input, not our failure; a
 * clipping library that gives up on a shape is reported the same way, never as a 500.
 */
function geoInput<T>(fn: () => T, path: string): T {
  try {
    return fn();
  } catch (err) {
    if (err instanceof GeoInputError) {
      throw new DomainError('invalid_geometry', err.message, [{ path: [path], message: err.message }]);
    }
    console.warn('[zone-maps] polygon clipping failed:', err);
    const message =
      'This shape could not be worked out: simplify it (fewer, farther-apart vertices) and try again';
    throw new DomainError('invalid_geometry', message, [{ path: [path], message }]);
  }
}

/** A drawn or edited geometry: valid as PostGIS decides (else a 422 naming why and where), clipped to the boundary. */
async function drawnGeometry(
  geometry: z.output<typeof addZoneSchema>['geometry'],
  boundary: MultiPolygon,
  t: Transaction,
) {
  const multi = toMultiPolygon(geometry);
  await assertValidInput(multi, t);
  const [zone] = geoInput(
    () => clipToBoundary([{ type: 'Feature', properties: { id: 'drawn' }, geometry: multi }], boundary),
    'geometry',
  );
  return zone?.geometry ?? { type: 'MultiPolygon' as const, coordinates: [] };
}

export function addZone(actor: Actor, id: string, input: z.output<typeof addZoneSchema>) {
  return edit(actor, id, input.version, async ({ t, map, boundary }) => {
    const geometry = await drawnGeometry(input.geometry, boundary, t);
    await insertZone(
      t,
      map,
      {
        name: input.name,
        classValue: input.classValue,
        productivityIndex: input.productivityIndex,
        isDefault: false,
        meanValue: null,
        geometry,
      },
      `The new zone "${input.name}"`,
    );
  });
}

export function updateZone(
  actor: Actor,
  id: string,
  zoneId: string,
  input: z.output<typeof updateZoneSchema>,
) {
  return edit(actor, id, input.version, async ({ t, zones, boundary }) => {
    const zone = zoneIn(zones, zoneId);
    const attrs = {
      name: input.name,
      classValue: input.classValue,
      productivityIndex: input.productivityIndex,
    };
    const geometry = input.geometry ? await drawnGeometry(input.geometry, boundary, t) : undefined;
    await updateZoneRow(t, zone.id, { ...attrs, geometry }, `Zone "${input.name}"`);
  });
}

export function deleteZone(actor: Actor, id: string, zoneId: string, version: number) {
  return edit(actor, id, version, async ({ t, zones }) => {
    await deleteZoneRow(t, zoneIn(zones, zoneId).id);
  });
}

const partName = (name: string, n: number) => {
  const suffix = ` (${n})`;
  return name.slice(0, ZONE_NAME_MAX - suffix.length) + suffix;
};

export function split(actor: Actor, id: string, input: z.output<typeof splitZoneSchema>) {
  return edit(actor, id, input.version, async ({ t, map, zones }) => {
    const zone = zoneIn(zones, input.zoneId);
    const line = {
      type: 'LineString' as const,
      coordinates: input.line.coordinates.map(([lon, lat]) => [lon, lat]),
    };
    const [first, second] = geoInput(() => splitZone(toGeoFeature(zone), line), 'line');
    await updateZoneRow(t, zone.id, { geometry: first }, `Zone "${zone.name}"`);
    await insertZone(
      t,
      map,
      // The cut-off part is a zone the user made: only the part that stays keeps a default flag.
      { ...zone, name: partName(zone.name, 2), isDefault: false, geometry: second, sortOrder: undefined },
      `The second part of "${zone.name}"`,
    );
  });
}

export function merge(actor: Actor, id: string, input: z.output<typeof mergeZonesSchema>) {
  return edit(actor, id, input.version, async ({ t, zones }) => {
    const [aId, bId] = input.zoneIds;
    if (aId === bId)
      throw new ValidationError('Choose two different zones to merge', [
        { path: ['zoneIds', 1], message: 'The same zone twice' },
      ]);
    const a = zoneIn(zones, aId, 'zoneIds.0');
    const b = zoneIn(zones, bId, 'zoneIds.1');
    const geometry = geoInput(() => mergeZones(toGeoFeature(a), toGeoFeature(b)), 'zoneIds');
    await updateZoneRow(t, a.id, { geometry }, `Zone "${a.name}"`);
    await deleteZoneRow(t, b.id);
  });
}

export function resolveOverlap(actor: Actor, id: string, input: z.output<typeof resolveOverlapSchema>) {
  return edit(actor, id, input.version, async ({ t, zones }) => {
    if (input.keepZoneId === input.loseZoneId) {
      throw new ValidationError('Choose two different zones', [
        { path: ['loseZoneId'], message: 'The same zone twice' },
      ]);
    }
    zoneIn(zones, input.keepZoneId, 'keepZoneId');
    const lose = zoneIn(zones, input.loseZoneId, 'loseZoneId');
    const after = geoInput(
      () => resolveOverlapGeo(zones.map(toGeoFeature), input.keepZoneId, input.loseZoneId),
      'loseZoneId',
    );
    const left = after.find((f) => f.properties.id === lose.id);
    // A zone that lay wholly inside the one that keeps the overlap has nothing left: it goes.
    if (!left || left.geometry.coordinates.length === 0) await deleteZoneRow(t, lose.id);
    else await updateZoneRow(t, lose.id, { geometry: left.geometry }, `Zone "${lose.name}"`);
  });
}

/**
 * Gaps (boundary no zone covers) go to the default zone: added to it when there is one (shared/geo fillGaps
 * decides), else a new one. Nothing changes when there is no gap.
 */
export async function fillGapsOf(
  t: Transaction,
  map: { id: string; workspaceId: string },
  zones: ZoneRow[],
  boundary: MultiPolygon,
) {
  const marker = 'new-default-zone';
  const before = zones.map(toGeoFeature);
  const after = fillGapsGeo(before, boundary, { id: marker, name: DEFAULT_ZONE_NAME });
  for (const [i, f] of after.entries()) {
    if (f.properties.id === marker) await insertZone(t, map, defaultZone(f.geometry));
    else if (f !== before[i])
      await updateZoneRow(t, f.properties.id, { geometry: f.geometry }, `Zone "${zones[i].name}"`);
  }
}

export function fillGaps(actor: Actor, id: string, version: number) {
  return edit(actor, id, version, ({ t, map, zones, boundary }) => fillGapsOf(t, map, zones, boundary));
}

/** Archives or restores a zone map (its zones stay as they are); raises its version. */
export async function setZoneMapArchived(actor: Actor, id: string, archived: boolean) {
  await ZoneMap.sequelize!.transaction(async (t) => {
    const map = assertFound(
      await ZoneMap.findOne({ where: scopedWhere(actor, { id }), transaction: t, lock: t.LOCK.UPDATE }),
      'Zone map',
    );
    map.archivedAt = archived ? new Date() : null;
    await map.save({ transaction: t });
  });
  return getZoneMap(actor, id);
}
