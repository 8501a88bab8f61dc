import { Component, lazy, Suspense, type ReactNode } from 'react';
import type { MapFrameProps } from './map-types';

// MapLibre and the drawing library are large: they load in their own chunk, the first time a map is shown.
const MapCanvas = lazy(() => import('./map-canvas'));

/** Says so when the map could not start (no WebGL, or its code could not be loaded) instead of a blank box. */
class MapErrorBoundary extends Component<
  { children: ReactNode; className: string },
  { error: Error | null }
> {
  state = { error: null as Error | null };
  static getDerivedStateFromError(error: Error) {
    return { error };
  }
  render() {
    if (!this.state.error) return this.props.children;
    return (
      <div
        role="alert"
        className={`grid place-items-center rounded-card border border-danger/40 bg-danger-soft p-4 text-sm text-ink ${this.props.className}`}
      >
        The map could not be drawn here ({this.state.error.message}). The tables below still hold every
        figure.
      </div>
    );
  }
}

/** The map frame: a paper-and-ink MapLibre map of a field's boundary and areas (see map-types.ts). */
export function MapFrame(props: MapFrameProps) {
  const cls = props.className ?? 'h-[460px]';
  return (
    <MapErrorBoundary className={cls}>
      <Suspense
        fallback={
          <div
            className={`grid place-items-center rounded-card border border-ink-line bg-paper-sunk text-sm text-ink-soft ${cls}`}
          >
            Loading the map…
          </div>
        }
      >
        <MapCanvas {...props} />
      </Suspense>
    </MapErrorBoundary>
  );
}
