import { roundTo } from '../../../shared/units';
import type { z } from 'zod';
import type { MultiPolygon } from 'geojson';
import { Field } from '../../db/associations';
import { stripCrs } from '../../lib/geometry';
import { inScope } from '../../lib/scope';
import { ConflictError, DomainError, NotFoundError, ValidationError } from '../../errors';
import type { Actor } from '../../types';
import { clipToBoundary, fillGaps } from '../../../shared/geo/zone-ops';
import {
  CLASS_METHOD_LABELS,
  type zoneMapFromImportSchema,
  type zonesFromPointsPreviewRequestSchema,
  type zonesFromPointsSchema,
} from '../../../shared/schemas/zone-map.schema';
import { loadImportFeatures, loadImportPoints } from '../imports/import.service';
import { DEFAULT_ZONE_NAME, createZoneMapWith } from './zone-map.service';
import type { ZoneInput } from './zone-store';
import { zonesFromPointsInWorker } from './zones-from-points.runner';

const ZONE_NAME_MAX = 60;
type Props = Record<string, unknown>;

/** A property's value as a number in [min, max] (whole if asked), null when empty; else a message naming the place. */
function numberProperty(
  props: Props,
  key: string | null,
  where: string,
  range: { min: number; max: number; whole: boolean },
) {
  if (!key) return null;
  const raw = props[key];
  if (raw === null || raw === undefined || (typeof raw === 'string' && raw.trim() === '')) return null;
  const value = typeof raw === 'number' ? raw : Number(String(raw).trim().replace(',', '.'));
  if (
    !Number.isFinite(value) ||
    value < range.min ||
    value > range.max ||
    (range.whole && !Number.isInteger(value))
  ) {
    const kind = range.whole
      ? `a whole number from ${range.min} to ${range.max}`
      : `a number from ${range.min} to ${range.max}`;
    const message = `${where}: "${key}" is ${JSON.stringify(raw)}, not ${kind}`;
    throw new ValidationError(message, [{ path: [key], message }]);
  }
  return value;
}

function nameProperty(props: Props, key: string | null, fallback: string) {
  const raw = key ? props[key] : null;
  const text = raw === null || raw === undefined ? '' : String(raw).trim();
  return (text || fallback).slice(0, ZONE_NAME_MAX);
}

/**
 * A zone map from polygon features of an import: the chosen features clipped to the field boundary, named and
 * classed from the chosen properties. Overlaps are kept (the user resolves them); gaps become a default zone
 * only when asked. Features entirely outside the boundary are refused by name.
 */
export async function createFromImport(actor: Actor, input: z.output<typeof zoneMapFromImportSchema>) {
  const features = await loadImportFeatures(actor, input.importId);
  const byIndex = new Map(features.map((f) => [f.index, f]));
  const chosen = input.featureIndexes.map((index, k) => {
    const f = byIndex.get(index);
    if (!f) {
      const message = `Feature ${index + 1} is not a polygon of this file`;
      throw new ValidationError(message, [{ path: ['featureIndexes', k], message }]);
    }
    const where = `Feature ${index + 1}`;
    return {
      type: 'Feature' as const,
      properties: {
        id: String(k),
        name: nameProperty(f.properties, input.nameProperty, `Zone ${k + 1}`),
        classValue: numberProperty(f.properties, input.classProperty, where, {
          min: 0,
          max: 254,
          whole: true,
        }),
        productivityIndex: numberProperty(f.properties, input.indexProperty, where, {
          min: 0,
          max: 10,
          whole: false,
        }),
        isDefault: false,
      },
      geometry: f.geometry,
    };
  });
  const properties = [input.nameProperty, input.classProperty, input.indexProperty].filter(Boolean);
  const sourceNote = `Imported features ${input.featureIndexes.map((i) => i + 1).join(', ')}${properties.length ? `; properties ${properties.join(', ')}` : ''}`;
  return createZoneMapWith(actor, { ...input, source: 'imported', sourceNote }, (boundary) => {
    const clipped = clipToBoundary(chosen, boundary);
    const outside = chosen.filter((f) => !clipped.some((c) => c.properties.id === f.properties.id));
    if (outside.length) {
      const list = outside.map((f) => input.featureIndexes[Number(f.properties.id)] + 1).join(', ');
      const message = `Feature ${list} lies outside the field boundary`;
      throw new DomainError('invalid_geometry', message, [{ path: ['featureIndexes'], message }]);
    }
    const zones = input.fillGaps
      ? fillGaps(clipped, boundary, { id: 'default', name: DEFAULT_ZONE_NAME })
      : clipped;
    return zones.map((f): ZoneInput => ({
      name: f.properties.name,
      classValue: f.properties.classValue,
      productivityIndex: f.properties.productivityIndex,
      isDefault: f.properties.isDefault,
      meanValue: null,
      geometry: f.geometry,
    }));
  });
}

/** The boundary of a field in the actor's scope (404 otherwise; 409 when it has none). */
async function boundaryOfField(actor: Actor, fieldId: string): Promise<MultiPolygon> {
  const field = await Field.findByPk(fieldId);
  if (!field || !inScope(actor, field.workspaceId, field.growerId)) throw new NotFoundError('Field');
  if (!field.boundary) {
    const message = `The field "${field.name}" has no boundary yet: set its boundary first, then make zones`;
    throw new ConflictError(message, 'conflict', [{ path: ['fieldId'], message }]);
  }
  return stripCrs(field.boundary) as MultiPolygon;
}

/** The points of the import, interpolated, classed and turned into draft zones (shared/geo zonesFromPoints). */
async function draft(actor: Actor, input: z.output<typeof zonesFromPointsPreviewRequestSchema>) {
  const boundary = await boundaryOfField(actor, input.fieldId);
  const points = await loadImportPoints(actor, input.importId, input.attribute);
  if (points.length < 3) {
    const message = `Only ${points.length} points carry a value of "${input.attribute}": at least 3 are needed`;
    throw new ValidationError(message, [{ path: ['attribute'], message }]);
  }
  return zonesFromPointsInWorker(points, boundary, {
    classes: input.classes,
    method: input.method,
    cellSizeM: input.cellSizeM,
    power: input.power,
    minAreaM2: input.minAreaM2,
  });
}

/** Draft zones, class breaks and the histogram of the interpolated values, nothing saved. */
export async function previewFromPoints(
  actor: Actor,
  input: z.output<typeof zonesFromPointsPreviewRequestSchema>,
) {
  const result = await draft(actor, input);
  const { edges, counts } = result.histogram;
  return {
    breaks: result.breaks,
    histogram: counts.map((count, i) => ({ from: edges[i], to: edges[i + 1], count })),
    zones: result.zones,
  };
}

/** A zone map of the draft zones: class 1 holds the lowest values; each zone keeps its mean value. */
export async function createFromPoints(actor: Actor, input: z.output<typeof zonesFromPointsSchema>) {
  const result = await draft(actor, input);
  const sourceNote =
    `${input.attribute}: ${CLASS_METHOD_LABELS[input.method]}, ${input.classes} classes, ${roundTo(input.cellSizeM, 1)} m cells, ` +
    `inverse distance power ${roundTo(input.power, 2)}, fragments under ${roundTo(input.minAreaM2 / 10_000, 3)} ha dissolved`;
  return createZoneMapWith(actor, { ...input, source: 'from-data', sourceNote }, () =>
    result.zones.map((z) => ({
      name: `Class ${z.classIndex + 1}`,
      classValue: z.classIndex + 1,
      productivityIndex: null,
      isDefault: false,
      meanValue: z.meanValue,
      geometry: z.geometry,
    })),
  );
}
