import { useEffect, useRef, useState } from 'react';
import maplibregl, { type GeoJSONSource, type LngLatBoundsLike, type Map as MaplibreMap } from 'maplibre-gl';
import 'maplibre-gl/dist/maplibre-gl.css';
import './map.css';
import type { Feature, FeatureCollection, Geometry, Position } from 'geojson';
import { DrawSession } from './draw-control';
import { hatchImage, mapStyle } from './map-style';
import type { MapFrameProps } from './map-types';

const collection = (features: Feature[]): FeatureCollection => ({ type: 'FeatureCollection', features });
const feature = (geometry: Geometry, properties: Record<string, unknown> = {}): Feature => ({
  type: 'Feature',
  properties,
  geometry,
});

function positionsOf(g: Geometry): Position[] {
  switch (g.type) {
    case 'Point':
      return [g.coordinates];
    case 'LineString':
    case 'MultiPoint':
      return g.coordinates;
    case 'Polygon':
    case 'MultiLineString':
      return g.coordinates.flat();
    case 'MultiPolygon':
      return g.coordinates.flat(2);
    default:
      return g.geometries.flatMap(positionsOf);
  }
}

type Bbox = [number, number, number, number];

function bboxOf(positions: Position[]): Bbox | null {
  if (positions.length === 0) return null;
  let [w, s, e, n] = [Infinity, Infinity, -Infinity, -Infinity];
  for (const [x, y] of positions) {
    if (x < w) w = x;
    if (x > e) e = x;
    if (y < s) s = y;
    if (y > n) n = y;
  }
  return [w, s, e, n];
}

/** Faint ruled lines about the field, like squared paper: a round step giving some 8 lines across it. */
function rules(b: Bbox): FeatureCollection {
  const field = Math.max(b[2] - b[0], b[3] - b[1], 1e-4);
  const span = field * 3;
  const raw = field / 8;
  const pow = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * pow).find((v) => v >= raw) ?? raw;
  const [cx, cy] = [(b[0] + b[2]) / 2, (b[1] + b[3]) / 2];
  const [w, s, e, n] = [cx - span, cy - span, cx + span, cy + span];
  const lines: Feature[] = [];
  for (let x = Math.ceil(w / step) * step; x <= e; x += step)
    lines.push(
      feature({
        type: 'LineString',
        coordinates: [
          [x, s],
          [x, n],
        ],
      }),
    );
  for (let y = Math.ceil(s / step) * step; y <= n; y += step)
    lines.push(
      feature({
        type: 'LineString',
        coordinates: [
          [w, y],
          [e, y],
        ],
      }),
    );
  return collection(lines);
}

/**
 * The MapLibre map itself (loaded lazily by MapFrame, in its own chunk). Everything it draws comes from the
 * props; nothing is fetched. The container carries `data-ready` once the map has drawn, and `data-view`
 * (west,south,east,north of the view), so a browser test can place the pointer on a known place.
 */
export default function MapCanvas(props: MapFrameProps) {
  const {
    label,
    unitSystem,
    boundary,
    areas,
    lines,
    markers,
    points,
    selectedIds,
    draw,
    legend,
    fitKey,
    className = 'h-[460px]',
  } = props;
  const container = useRef<HTMLDivElement>(null);
  const mapRef = useRef<MaplibreMap | null>(null);
  const scaleRef = useRef<maplibregl.ScaleControl | null>(null);
  const drawRef = useRef<DrawSession | null>(null);
  const latest = useRef(props);
  latest.current = props;
  const [ready, setReady] = useState(false);
  const [hover, setHover] = useState<{ id: string; x: number; y: number } | null>(null);
  const drawing = !!draw;
  const drawingRef = useRef(drawing);
  drawingRef.current = drawing;

  useEffect(() => {
    const el = container.current;
    if (!el) return;
    const map = new maplibregl.Map({
      container: el,
      style: mapStyle,
      center: [0, 0],
      zoom: 1,
      maxZoom: 21,
      attributionControl: false,
      dragRotate: false,
      pitchWithRotate: false,
      touchPitch: false,
      fadeDuration: 0,
    });
    map.touchZoomRotate.disableRotation();
    mapRef.current = map;
    map.addControl(new maplibregl.NavigationControl({ showCompass: false }), 'top-right');
    const scale = new maplibregl.ScaleControl({ unit: latest.current.unitSystem, maxWidth: 140 });
    scaleRef.current = scale;
    map.addControl(scale, 'bottom-left');
    const noteView = () => {
      const b = map.getBounds();
      el.dataset.view = [b.getWest(), b.getSouth(), b.getEast(), b.getNorth()].join(',');
    };
    map.on('moveend', noteView);
    map.on('load', () => {
      map.addImage('hatch', hatchImage([138, 98, 16]));
      map.addImage('hatch-danger', hatchImage([154, 47, 47]));
      drawRef.current = new DrawSession(map);
      noteView();
      setReady(true);
    });
    map.on('idle', () => {
      el.dataset.ready = 'true';
    });
    let hovered: string | null = null;
    const setHovered = (id: string | null) => {
      if (hovered === id) return;
      if (hovered) map.setFeatureState({ source: 'areas', id: hovered }, { hover: false });
      hovered = id;
      if (id) map.setFeatureState({ source: 'areas', id }, { hover: true });
    };
    map.on('mousemove', 'areas-fill', (e) => {
      if (drawingRef.current) return setHovered(null);
      const id = e.features?.[0]?.properties?.id as string | undefined;
      setHovered(id ?? null);
      map.getCanvas().style.cursor = latest.current.onAreaClick ? 'pointer' : '';
      setHover(id ? { id, x: e.point.x, y: e.point.y } : null);
    });
    map.on('mouseleave', 'areas-fill', () => {
      setHovered(null);
      map.getCanvas().style.cursor = '';
      setHover(null);
    });
    map.on('click', 'areas-fill', (e) => {
      if (drawingRef.current) return;
      const id = e.features?.[0]?.properties?.id as string | undefined;
      if (id)
        latest.current.onAreaClick?.(id, {
          add: e.originalEvent.shiftKey || e.originalEvent.metaKey || e.originalEvent.ctrlKey,
        });
    });
    return () => {
      drawRef.current?.stop();
      drawRef.current = null;
      mapRef.current = null;
      setReady(false);
      delete el.dataset.ready;
      map.remove();
    };
  }, []);

  useEffect(() => {
    scaleRef.current?.setUnit(unitSystem);
  }, [unitSystem]);

  // Data into the sources.
  useEffect(() => {
    const map = mapRef.current;
    if (!ready || !map) return;
    const set = (id: string, fc: FeatureCollection) =>
      (map.getSource(id) as GeoJSONSource | undefined)?.setData(fc);
    set('boundary', collection(boundary ? [feature(boundary)] : []));
    set(
      'areas',
      collection(
        (areas ?? []).map((a) => feature(a.geometry, { id: a.id, colour: a.colour, style: a.style })),
      ),
    );
    set('lines', collection((lines ?? []).map((l) => feature(l.geometry, { id: l.id, style: l.style }))));
    set(
      'markers',
      collection(
        (markers ?? []).map((m) => feature({ type: 'Point', coordinates: m.position }, { id: m.id })),
      ),
    );
    set(
      'points',
      collection(
        (points ?? []).map((p) => feature({ type: 'Point', coordinates: p.position }, { colour: p.colour })),
      ),
    );
  }, [ready, boundary, areas, lines, markers, points]);

  useEffect(() => {
    const map = mapRef.current;
    if (!ready || !map) return;
    map.setFilter('areas-selected', ['in', ['get', 'id'], ['literal', selectedIds ?? []]]);
  }, [ready, selectedIds]);

  // Fit to the field (or to whatever is shown) when the subject changes.
  const fit = () => {
    const map = mapRef.current;
    const p = latest.current;
    if (!map) return;
    // The field and everything drawn on it: a file's features may lie beside the field, or elsewhere.
    const shapes: Geometry[] = [
      ...(p.boundary ? [p.boundary] : []),
      ...(p.areas ?? []).map((a) => a.geometry),
    ];
    const positions = shapes.flatMap(positionsOf).concat((p.points ?? []).map((pt) => pt.position));
    const b = bboxOf(positions);
    if (!b) return;
    (map.getSource('rules') as GeoJSONSource | undefined)?.setData(rules(b));
    map.fitBounds(
      [
        [b[0], b[1]],
        [b[2], b[3]],
      ] as LngLatBoundsLike,
      { padding: 36, animate: false, maxZoom: 18 },
    );
  };
  const fitRef = useRef(fit);
  fitRef.current = fit;
  const hasSubject = !!boundary || (areas?.length ?? 0) > 0 || (points?.length ?? 0) > 0;
  useEffect(() => {
    if (ready && hasSubject) fitRef.current();
  }, [ready, fitKey, hasSubject]);

  // Drawing: restarted only when the kind of drawing changes, so a vertex edit survives re-renders.
  const drawKey = draw ? `${draw.mode}` : '';
  useEffect(() => {
    const session = drawRef.current;
    if (!ready || !session) return;
    const request = latest.current.draw;
    if (!request) return;
    setHover(null);
    if (request.mode === 'edit') {
      session.start({
        ...request,
        onChange: (g) => (latest.current.draw as typeof request | null)?.onChange(g),
      });
    } else {
      session.start({
        ...request,
        onDone: (g: never) => (latest.current.draw as typeof request | null)?.onDone(g),
      } as typeof request);
    }
    return () => session.stop();
  }, [ready, drawKey]);

  const hoverText = hover && !drawing ? props.describeArea?.(hover.id) : null;

  return (
    <div
      className={`sowright-map relative overflow-hidden rounded-card border border-ink-line ${className}`}
      role="region"
      aria-label={label}
    >
      <div ref={container} className="h-full w-full" data-testid="map" />
      {ready ? null : (
        <p className="absolute inset-0 grid place-items-center text-sm text-ink-soft">Drawing the map…</p>
      )}
      <button
        type="button"
        onClick={() => fitRef.current()}
        className="absolute top-2.5 left-2.5 z-10 cursor-pointer rounded-card border border-ink-line bg-paper-raised/95 px-2 py-1 text-xs font-medium text-ink shadow-card hover:bg-paper"
      >
        Fit to field
      </button>
      {draw && draw.mode !== 'edit' ? (
        <div className="absolute top-2.5 left-1/2 z-10 flex max-w-[80%] -translate-x-1/2 flex-wrap items-center gap-2 rounded-card border border-clay-300 bg-paper-raised/95 px-3 py-1.5 text-xs text-ink shadow-card">
          <span>
            {draw.hint ??
              (draw.mode === 'polygon'
                ? 'Click to place corners; click the first corner again, or press Finish.'
                : 'Click to place points along the line; click the last point again, or press Finish.')}
          </span>
          <button
            type="button"
            className="cursor-pointer rounded-sm border border-clay-700 bg-clay-600 px-2 py-0.5 font-medium text-paper-raised"
            onClick={() => drawRef.current?.finish()}
          >
            Finish
          </button>
          <button
            type="button"
            className="cursor-pointer rounded-sm border border-ink-line bg-paper-raised px-2 py-0.5"
            onClick={() => draw.onCancel()}
          >
            Cancel
          </button>
        </div>
      ) : draw?.hint ? (
        <p className="absolute top-2.5 left-1/2 z-10 max-w-[70%] -translate-x-1/2 rounded-card border border-clay-300 bg-paper-raised/95 px-3 py-1.5 text-xs text-ink shadow-card">
          {draw.hint}
        </p>
      ) : null}
      {hoverText ? (
        <div
          className="pointer-events-none absolute z-10 max-w-60 rounded-card border border-ink-line bg-paper-raised/95 px-2 py-1 text-xs text-ink shadow-card"
          style={{ left: hover!.x + 14, top: hover!.y + 14 }}
        >
          {hoverText}
        </div>
      ) : null}
      {legend ? <div className="absolute right-2.5 bottom-2.5 z-10">{legend}</div> : null}
    </div>
  );
}
