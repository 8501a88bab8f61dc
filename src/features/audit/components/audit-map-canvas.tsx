import { useEffect, useRef, useState, type ReactNode } from 'react';
import maplibregl, {
  type ExpressionSpecification,
  type LayerSpecification,
  type LngLatBoundsLike,
  type Map as MaplibreMap,
  type SourceSpecification,
  type StyleSpecification,
  type VectorTileSource,
} from 'maplibre-gl';
import 'maplibre-gl/dist/maplibre-gl.css';
import '@/components/map/map.css';
import type { FeatureCollection, MultiPolygon, Position } from 'geojson';
import type { UnitSystem } from '@shared/units';
import { INK } from '@/components/map/map-style';
import { NO_VALUE, type Stop } from './map-colours';

export type PointValues = Record<string, number | undefined>;

/**
 * What a diagnostic draws over the points (alarm starts, the coverage raster): its sources and layers, the
 * marker pictures its symbol layers name, and which of its layers are hidden now.
 */
export type MapOverlay = {
  sources: Record<string, SourceSpecification>;
  layers: LayerSpecification[];
  images?: Record<string, () => ImageData>;
  hidden?: string[];
  /** Leave the log's points out (the overlay says it all). */
  hidePoints?: boolean;
};

export type AuditMapCanvasProps = {
  label: string;
  unitSystem: UnitSystem;
  /** Tiles of the log's kept points: `/api/logs/:id/tiles/{z}/{x}/{y}` on this origin. */
  logId: string;
  /** Changes when the points change (a new cleaning), so no old tile is reused. */
  tileVersion: number;
  boundary: MultiPolygon;
  zones: { id: string; geometry: MultiPolygon }[];
  /** Working width of the planter, m: each point is drawn as wide as the strip it planted. */
  swathM: number;
  /** The tile property that colours the points, and its stops. */
  property: string;
  stops: Stop[];
  describePoint: (values: PointValues) => ReactNode;
  legend: ReactNode;
  className?: string;
  overlay?: MapOverlay;
};

const fc = (geoms: MultiPolygon[]): FeatureCollection => ({
  type: 'FeatureCollection',
  features: geoms.map((geometry) => ({ type: 'Feature', properties: {}, geometry })),
});

const tileUrl = (logId: string, version: number) =>
  `${window.location.origin}/api/logs/${encodeURIComponent(logId)}/tiles/{z}/{x}/{y}?v=${version}`;

function colourOf(property: string, stops: Stop[]): ExpressionSpecification {
  return [
    'case',
    ['has', property],
    ['interpolate', ['linear'], ['to-number', ['get', property]], ...stops.flat()],
    NO_VALUE,
  ] as ExpressionSpecification;
}

/** Web Mercator ground size of one CSS pixel at zoom 0 on the equator, m (512-pixel tiles, as MapLibre draws). */
const M_PER_PX_Z0 = 40_075_016.68557849 / 512;

/**
 * A circle radius of a little over half the swath on the ground at every zoom, so passes read as planted
 * strips even where the tiles snap points to their pixel grid; never under 1.2 pixels.
 */
function radiusBySwath(swathM: number, lat: number): ExpressionSpecification {
  const stops: number[] = [];
  for (let z = 8; z <= 22; z += 1) {
    const mPerPx = (M_PER_PX_Z0 * Math.cos((lat * Math.PI) / 180)) / 2 ** z;
    // The server's tiles (512 px at map zoom z + 1) hold averaged cells, 64 a side at tile zooms 13–15 and
    // 128 a side at 12 and 16–18 (server/routes/logs/log-tiles.ts): a dot never smaller than 0.75 × √2 of the
    // spacing of the cells, so neighbouring cells touch instead of leaving a grid of dots.
    const tileZ = z - 1;
    const cellPx = tileZ >= 13 && tileZ <= 15 ? 8 : tileZ <= 18 ? 4 : 4 * 2 ** (tileZ - 18);
    stops.push(z, Math.max(1.2, (0.6 * swathM) / mPerPx, 0.75 * cellPx * Math.SQRT2));
  }
  return ['interpolate', ['exponential', 2], ['zoom'], ...stops] as ExpressionSpecification;
}

function bounds(g: MultiPolygon): LngLatBoundsLike {
  const pts: Position[] = g.coordinates.flat(2);
  let [w, s, e, n] = [Infinity, Infinity, -Infinity, -Infinity];
  for (const [x, y] of pts) {
    w = Math.min(w, x);
    e = Math.max(e, x);
    s = Math.min(s, y);
    n = Math.max(n, y);
  }
  return [
    [w, s],
    [e, n],
  ];
}

/**
 * A map of one log's points from vector tiles the server makes (PostGIS ST_AsMVT), coloured by one
 * property, over the prescription's zone outlines and the field boundary. The canvas keeps its drawing
 * buffer so the printed report carries a picture of it (`beforeprint`).
 */
export default function AuditMapCanvas(props: AuditMapCanvasProps) {
  const { label, unitSystem, logId, tileVersion, property, stops, legend } = props;
  const container = useRef<HTMLDivElement>(null);
  const snapshot = useRef<HTMLImageElement>(null);
  const mapRef = useRef<MaplibreMap | null>(null);
  const latest = useRef(props);
  latest.current = props;
  const [ready, setReady] = useState(false);
  const [hover, setHover] = useState<{ values: PointValues; x: number; y: number } | null>(null);

  useEffect(() => {
    const el = container.current;
    if (!el) return;
    const p = latest.current;
    const style: StyleSpecification = {
      version: 8,
      name: 'Sowright audit',
      sources: {
        boundary: { type: 'geojson', data: fc([p.boundary]) },
        zones: { type: 'geojson', data: fc(p.zones.map((z) => z.geometry)) },
        log: { type: 'vector', tiles: [tileUrl(p.logId, p.tileVersion)], minzoom: 0, maxzoom: 18 },
        ...p.overlay?.sources,
      },
      layers: [
        { id: 'paper', type: 'background', paint: { 'background-color': INK.paper } },
        {
          id: 'boundary-fill',
          type: 'fill',
          source: 'boundary',
          paint: { 'fill-color': INK.rule, 'fill-opacity': 0.75 },
        },
        {
          id: 'points',
          type: 'circle',
          source: 'log',
          'source-layer': 'points',
          layout: { visibility: p.overlay?.hidePoints ? 'none' : 'visible' },
          paint: {
            'circle-color': colourOf(p.property, p.stops),
            'circle-radius': radiusBySwath(p.swathM, (bounds(p.boundary) as [number, number][])[0][1]),
          },
        },
        ...(p.overlay?.layers.filter((l) => l.type !== 'symbol' && l.type !== 'circle') ?? []),
        {
          id: 'zones-line',
          type: 'line',
          source: 'zones',
          paint: { 'line-color': INK.ink, 'line-width': 1.25, 'line-opacity': 0.7, 'line-dasharray': [3, 2] },
        },
        {
          id: 'boundary-line',
          type: 'line',
          source: 'boundary',
          paint: { 'line-color': INK.ink, 'line-width': 2.25 },
        },
        // Markers above the outlines.
        ...(p.overlay?.layers.filter((l) => l.type === 'symbol' || l.type === 'circle') ?? []),
      ],
    };
    const map = new maplibregl.Map({
      container: el,
      style,
      bounds: bounds(p.boundary),
      fitBoundsOptions: { padding: 28 },
      maxZoom: 21,
      attributionControl: false,
      dragRotate: false,
      pitchWithRotate: false,
      touchPitch: false,
      fadeDuration: 0,
      canvasContextAttributes: { preserveDrawingBuffer: true },
    });
    map.touchZoomRotate.disableRotation();
    mapRef.current = map;
    map.addControl(new maplibregl.NavigationControl({ showCompass: false }), 'top-right');
    map.addControl(new maplibregl.ScaleControl({ unit: p.unitSystem, maxWidth: 120 }), 'bottom-left');
    map.on('styleimagemissing', (e: { id: string }) => {
      const make = latest.current.overlay?.images?.[e.id];
      if (make && !map.hasImage(e.id)) map.addImage(e.id, make(), { pixelRatio: 2 });
    });
    map.on('load', () => setReady(true));
    map.on('idle', () => {
      el.dataset.ready = 'true';
    });
    map.on('mousemove', 'points', (e) => {
      const f = e.features?.[0];
      setHover(f ? { values: f.properties as PointValues, x: e.point.x, y: e.point.y } : null);
      map.getCanvas().style.cursor = 'crosshair';
    });
    map.on('mouseleave', 'points', () => {
      setHover(null);
      map.getCanvas().style.cursor = '';
    });
    // The printed page holds a picture of the map: WebGL canvases do not print reliably.
    const toPicture = () => {
      if (snapshot.current) snapshot.current.src = map.getCanvas().toDataURL('image/png');
    };
    window.addEventListener('beforeprint', toPicture);
    return () => {
      window.removeEventListener('beforeprint', toPicture);
      mapRef.current = null;
      setReady(false);
      delete el.dataset.ready;
      map.remove();
    };
  }, []);

  useEffect(() => {
    const map = mapRef.current;
    if (!ready || !map) return;
    map.setPaintProperty('points', 'circle-color', colourOf(property, stops));
  }, [ready, property, stops]);

  const hidden = props.overlay?.hidden?.join('\n') ?? '';
  useEffect(() => {
    const map = mapRef.current;
    if (!ready || !map) return;
    const off = new Set(hidden.split('\n'));
    for (const l of latest.current.overlay?.layers ?? [])
      map.setLayoutProperty(l.id, 'visibility', off.has(l.id) ? 'none' : 'visible');
  }, [ready, hidden]);

  useEffect(() => {
    const map = mapRef.current;
    if (!ready || !map) return;
    (map.getSource('log') as VectorTileSource | undefined)?.setTiles([tileUrl(logId, tileVersion)]);
  }, [ready, logId, tileVersion]);

  const fit = () =>
    mapRef.current?.fitBounds(bounds(latest.current.boundary), { padding: 28, animate: false });
  const hoverText = hover ? props.describePoint(hover.values) : null;

  return (
    <div>
      <div
        className={`sowright-map relative overflow-hidden rounded-card border border-ink-line print:hidden ${props.className ?? 'h-[440px]'}`}
        role="region"
        aria-label={label}
      >
        <div ref={container} className="h-full w-full" data-testid="map" data-unit-system={unitSystem} />
        {ready ? null : (
          <p className="absolute inset-0 grid place-items-center text-sm text-ink-soft">Drawing the map…</p>
        )}
        <button
          type="button"
          onClick={fit}
          className="absolute top-2.5 left-2.5 z-10 cursor-pointer rounded-card border border-ink-line bg-paper-raised/95 px-2 py-1 text-xs font-medium text-ink shadow-card hover:bg-paper"
        >
          Fit to field
        </button>
        {hoverText ? (
          <div
            className="pointer-events-none absolute z-10 max-w-60 rounded-card border border-ink-line bg-paper-raised/95 px-2 py-1 text-xs text-ink shadow-card"
            style={{ left: hover!.x + 14, top: hover!.y + 14 }}
          >
            {hoverText}
          </div>
        ) : null}
      </div>
      <figure className="hidden print:block">
        <img ref={snapshot} alt={label} className="w-full rounded-card border border-ink-line" />
      </figure>
      <div className="mt-2">{legend}</div>
    </div>
  );
}
