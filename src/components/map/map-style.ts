import type { LayerSpecification, StyleSpecification } from 'maplibre-gl';

/**
 * Sowright's map: paper, ink and the zone ramp. Only a background, GeoJSON sources and fill, line and
 * circle layers, so it needs no glyphs, no sprites and no tiles: nothing is fetched from anywhere.
 */
export const INK = {
  paper: '#f3f0e8',
  rule: '#e2ddd0',
  ink: '#1f2630',
  soft: '#4a5462',
  line: '#fffdf8',
  accent: '#9e4624',
  caution: '#8a6210',
  cautionFill: '#e9c46a',
  repair: '#2d6b5a',
  danger: '#9a2f2f',
} as const;

export const SOURCES = ['rules', 'boundary', 'areas', 'lines', 'markers', 'points'] as const;

const empty = {
  type: 'geojson' as const,
  data: { type: 'FeatureCollection' as const, features: [] },
  promoteId: 'id',
};

const byStyle = (style: string | string[]) => [
  'in',
  ['get', 'style'],
  ['literal', Array.isArray(style) ? style : [style]],
];

const layers: LayerSpecification[] = [
  { id: 'paper', type: 'background', paint: { 'background-color': INK.paper } },
  { id: 'rules', type: 'line', source: 'rules', paint: { 'line-color': INK.rule, 'line-width': 1 } },
  {
    id: 'boundary-fill',
    type: 'fill',
    source: 'boundary',
    paint: { 'fill-color': INK.line, 'fill-opacity': 0.7 },
  },
  {
    id: 'areas-fill',
    type: 'fill',
    source: 'areas',
    paint: {
      'fill-color': ['get', 'colour'],
      'fill-opacity': [
        'match',
        ['get', 'style'],
        'zone',
        0.88,
        'chosen',
        0.55,
        'candidate',
        0.22,
        'invalid',
        0.3,
        0.12,
      ],
    },
  },
  {
    id: 'areas-hatch',
    type: 'fill',
    source: 'areas',
    filter: byStyle('invalid') as never,
    paint: { 'fill-pattern': 'hatch' },
  },
  {
    id: 'areas-edge',
    type: 'line',
    source: 'areas',
    filter: byStyle(['zone', 'muted']) as never,
    paint: { 'line-color': INK.line, 'line-width': 1.25 },
  },
  {
    id: 'areas-edge-candidate',
    type: 'line',
    source: 'areas',
    filter: byStyle(['candidate', 'chosen']) as never,
    paint: { 'line-color': INK.soft, 'line-width': ['match', ['get', 'style'], 'chosen', 1.75, 1] },
  },
  {
    id: 'areas-edge-invalid',
    type: 'line',
    source: 'areas',
    filter: byStyle('invalid') as never,
    paint: { 'line-color': INK.caution, 'line-width': 2, 'line-dasharray': [3, 1.5] },
  },
  {
    id: 'areas-hover',
    type: 'line',
    source: 'areas',
    paint: {
      'line-color': INK.ink,
      'line-width': 2.5,
      'line-opacity': ['case', ['boolean', ['feature-state', 'hover'], false], 1, 0],
    },
  },
  {
    id: 'areas-selected',
    type: 'line',
    source: 'areas',
    filter: ['in', ['get', 'id'], ['literal', []]],
    paint: { 'line-color': INK.accent, 'line-width': 3.5 },
  },
  {
    id: 'boundary-line',
    type: 'line',
    source: 'boundary',
    paint: { 'line-color': INK.ink, 'line-width': 2.25 },
  },
  {
    id: 'lines-repair',
    type: 'line',
    source: 'lines',
    filter: byStyle('repair') as never,
    paint: { 'line-color': INK.repair, 'line-width': 2.25, 'line-dasharray': [2, 1.25] },
  },
  {
    id: 'lines-overlap-fill',
    type: 'fill',
    source: 'lines',
    filter: ['all', byStyle('overlap'), ['==', ['geometry-type'], 'Polygon']] as never,
    paint: { 'fill-pattern': 'hatch-danger' },
  },
  {
    id: 'lines-overlap',
    type: 'line',
    source: 'lines',
    filter: byStyle('overlap') as never,
    paint: { 'line-color': INK.danger, 'line-width': 2 },
  },
  {
    id: 'lines-draft',
    type: 'line',
    source: 'lines',
    filter: byStyle('draft') as never,
    paint: { 'line-color': INK.accent, 'line-width': 2, 'line-dasharray': [1, 1] },
  },
  {
    id: 'points',
    type: 'circle',
    source: 'points',
    paint: {
      'circle-color': ['get', 'colour'],
      'circle-radius': 2.5,
      'circle-stroke-color': INK.ink,
      'circle-stroke-width': 0.25,
    },
  },
  {
    id: 'markers-halo',
    type: 'circle',
    source: 'markers',
    paint: {
      'circle-radius': 11,
      'circle-color': INK.cautionFill,
      'circle-opacity': 0.45,
      'circle-stroke-color': INK.caution,
      'circle-stroke-width': 1,
    },
  },
  {
    id: 'markers',
    type: 'circle',
    source: 'markers',
    paint: {
      'circle-radius': 4,
      'circle-color': INK.caution,
      'circle-stroke-color': INK.line,
      'circle-stroke-width': 1.5,
    },
  },
];

export const mapStyle: StyleSpecification = {
  version: 8,
  name: 'Sowright paper',
  sources: Object.fromEntries(SOURCES.map((s) => [s, empty])),
  layers,
};

/**
 * A diagonal hatch as raw pixels, for `fill-pattern` without a sprite sheet.
 */
export function hatchImage(rgb: [number, number, number], size = 8) {
  const data = new Uint8Array(size * size * 4);
  for (let y = 0; y < size; y++) {
    for (let x = 0; x < size; x++) {
      const on = (x + y) % size < 2;
      const i = (y * size + x) * 4;
      data.set(on ? [...rgb, 200] : [0, 0, 0, 0], i);
    }
  }
  return { width: size, height: size, data };
}
