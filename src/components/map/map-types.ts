import type { ReactNode } from 'react';
import type { LineString, MultiPolygon, Polygon } from 'geojson';
import type { UnitSystem } from '@shared/units';

export type AreaGeometry = Polygon | MultiPolygon;

/**
 * How an area is drawn. `zone`: a management zone in its ramp colour. `candidate`: a feature of a file
 * not chosen (yet). `chosen`: a feature picked for the boundary. `invalid`: a feature that is not a valid
 * polygon, hatched. `muted`: context only.
 */
export type AreaStyle = 'zone' | 'candidate' | 'chosen' | 'invalid' | 'muted';

export type MapArea = { id: string; geometry: AreaGeometry; colour: string; style: AreaStyle };

/** Outlines drawn over the areas: a repaired outline, an overlap between two zones, a draft. */
export type MapLine = {
  id: string;
  geometry: AreaGeometry | LineString;
  style: 'repair' | 'overlap' | 'draft';
};

/** A marked place, e.g. where a ring crosses itself. */
export type MapMarker = { id: string; position: [number, number] };

export type MapPoint = { position: [number, number]; colour: string };

/** What the user draws now. The map reports the geometry and leaves the drawing mode. */
export type DrawRequest =
  | { mode: 'polygon'; onDone: (g: Polygon) => void; onCancel: () => void; hint?: string }
  | { mode: 'line'; onDone: (g: LineString) => void; onCancel: () => void; hint?: string }
  /** Vertices of an existing shape; holes and parts are kept. Every change is reported. */
  | { mode: 'edit'; geometry: AreaGeometry; onChange: (g: AreaGeometry) => void; hint?: string };

export type MapFrameProps = {
  /** What the map shows, for assistive technology ("Zones of North quarter"). */
  label: string;
  unitSystem: UnitSystem;
  boundary?: AreaGeometry | null;
  areas?: MapArea[];
  lines?: MapLine[];
  markers?: MapMarker[];
  points?: MapPoint[];
  selectedIds?: string[];
  /** A click on an area (shift held: add to the selection). */
  onAreaClick?: (id: string, opts: { add: boolean }) => void;
  /** What to say beside the pointer over an area. */
  describeArea?: (id: string) => ReactNode;
  draw?: DrawRequest | null;
  legend?: ReactNode;
  /** Fits the view again whenever this changes (a new field, a new file). */
  fitKey?: string;
  className?: string;
};
