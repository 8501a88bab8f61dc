import MapboxDraw from '@mapbox/mapbox-gl-draw';
import type { Feature, LineString, Polygon } from 'geojson';
import type { Map as MaplibreMap } from 'maplibre-gl';
import type { AreaGeometry, DrawRequest } from './map-types';
import { INK } from './map-style';

// The drawing library was written for another map library: give it MapLibre's class names
// (DEVELOPERS.md, Decisions: "Drawing on the map").
const classes = MapboxDraw.constants.classes;
classes.CANVAS = 'maplibregl-canvas';
classes.CONTROL_BASE = 'maplibregl-ctrl';
classes.CONTROL_PREFIX = 'maplibregl-ctrl-';
classes.CONTROL_GROUP = 'maplibregl-ctrl-group';
classes.ATTRIBUTION = 'maplibregl-ctrl-attrib';

const isActive = ['==', ['get', 'active'], 'true'];
const isVertex = ['==', ['get', 'meta'], 'vertex'];

/** Our own drawing look: clay ink on paper. Dashes are not data-driven (one layer each). */
const drawStyles = [
  {
    id: 'draw-fill',
    type: 'fill',
    filter: ['==', ['geometry-type'], 'Polygon'],
    paint: { 'fill-color': INK.accent, 'fill-opacity': 0.12 },
  },
  {
    id: 'draw-line-active',
    type: 'line',
    filter: ['all', ['in', ['geometry-type'], ['literal', ['LineString', 'Polygon']]], isActive],
    layout: { 'line-cap': 'round', 'line-join': 'round' },
    paint: { 'line-color': INK.accent, 'line-width': 2.5, 'line-dasharray': [0.5, 1.5] },
  },
  {
    id: 'draw-line',
    type: 'line',
    filter: ['all', ['in', ['geometry-type'], ['literal', ['LineString', 'Polygon']]], ['!', isActive]],
    layout: { 'line-cap': 'round', 'line-join': 'round' },
    paint: { 'line-color': INK.accent, 'line-width': 2.5 },
  },
  {
    id: 'draw-vertex',
    type: 'circle',
    filter: ['all', ['==', ['geometry-type'], 'Point'], isVertex],
    paint: {
      'circle-radius': ['case', isActive, 6, 4.5],
      'circle-color': INK.line,
      'circle-stroke-color': INK.accent,
      'circle-stroke-width': 2,
    },
  },
  {
    id: 'draw-midpoint',
    type: 'circle',
    filter: ['==', ['get', 'meta'], 'midpoint'],
    paint: { 'circle-radius': 3, 'circle-color': INK.accent, 'circle-opacity': 0.7 },
  },
];

/** One drawing session on a map: started by `start`, ended by `stop`. */
export class DrawSession {
  private draw: MapboxDraw | null = null;
  private listeners: [string, (e: { features?: Feature[]; mode?: string }) => void][] = [];

  constructor(private readonly map: MaplibreMap) {}

  start(request: DrawRequest) {
    this.stop();
    const draw = new MapboxDraw({
      displayControlsDefault: false,
      controls: {},
      keybindings: true,
      boxSelect: false,
      userProperties: false,
      styles: drawStyles as never,
    });
    this.draw = draw;
    this.map.addControl(draw as never);
    const on = (type: string, fn: (e: { features?: Feature[]; mode?: string }) => void) => {
      this.map.on(type as never, fn as never);
      this.listeners.push([type, fn]);
    };
    if (request.mode === 'polygon' || request.mode === 'line') {
      on('draw.create', (e) => {
        const g = e.features?.[0]?.geometry;
        // The page ends the session (and removes the sketch) once it has the shape.
        if (request.mode === 'polygon' && g?.type === 'Polygon') request.onDone(g as Polygon);
        if (request.mode === 'line' && g?.type === 'LineString') request.onDone(g as LineString);
      });
      draw.changeMode(request.mode === 'polygon' ? 'draw_polygon' : 'draw_line_string');
    } else {
      const [id] = draw.add({ type: 'Feature', properties: {}, geometry: request.geometry });
      draw.changeMode('direct_select', { featureId: id });
      on('draw.update', (e) => {
        const g = e.features?.[0]?.geometry;
        if (g && (g.type === 'Polygon' || g.type === 'MultiPolygon')) request.onChange(g as AreaGeometry);
      });
      // Clicking beside the shape leaves vertex editing; keep it going until the page ends it.
      on('draw.modechange', (e) => {
        if (e.mode === 'simple_select' && this.draw === draw && draw.get(id)) {
          setTimeout(() => this.draw === draw && draw.changeMode('direct_select', { featureId: id }), 0);
        }
      });
    }
  }

  /** Ends a line or polygon being drawn as it stands (same as clicking its last point again). */
  finish() {
    if (this.draw && this.draw.getMode().startsWith('draw_')) this.draw.changeMode('simple_select');
  }

  stop() {
    for (const [type, fn] of this.listeners) this.map.off(type as never, fn as never);
    this.listeners = [];
    if (this.draw) {
      const draw = this.draw;
      this.draw = null;
      try {
        this.map.removeControl(draw as never);
      } catch {
        // The map is being removed with it.
      }
    }
  }
}
