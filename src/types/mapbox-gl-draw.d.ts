/**
 * The part of @mapbox/mapbox-gl-draw 1.5 that Sowright uses. Written here on purpose: its @types package
 * pulls in the typings of a map library we do not use. The map handed to it is MapLibre's.
 */
declare module '@mapbox/mapbox-gl-draw' {
  import type { Feature, FeatureCollection, Geometry } from 'geojson';
  import type { IControl, LayerSpecification } from 'maplibre-gl';

  type DrawMode = 'simple_select' | 'direct_select' | 'draw_line_string' | 'draw_polygon' | 'draw_point';

  interface DrawOptions {
    displayControlsDefault?: boolean;
    controls?: Partial<
      Record<
        'point' | 'line_string' | 'polygon' | 'trash' | 'combine_features' | 'uncombine_features',
        boolean
      >
    >;
    keybindings?: boolean;
    touchEnabled?: boolean;
    boxSelect?: boolean;
    clickBuffer?: number;
    touchBuffer?: number;
    userProperties?: boolean;
    defaultMode?: DrawMode;
    /** Style layers; each id is suffixed `.cold` and `.hot` by the library. */
    styles?: Omit<LayerSpecification, 'source'>[];
  }

  interface DrawConstants {
    classes: Record<
      | 'CANVAS'
      | 'CONTROL_BASE'
      | 'CONTROL_PREFIX'
      | 'CONTROL_BUTTON'
      | 'CONTROL_GROUP'
      | 'ATTRIBUTION'
      | 'ACTIVE_BUTTON'
      | 'BOX_SELECT',
      string
    >;
  }

  class MapboxDraw implements IControl {
    static constants: DrawConstants;
    constructor(options?: DrawOptions);
    onAdd(map: unknown): HTMLElement;
    onRemove(map: unknown): void;
    add(geojson: Feature | FeatureCollection | Geometry): string[];
    get(featureId: string): Feature | undefined;
    getAll(): FeatureCollection;
    deleteAll(): this;
    changeMode(mode: 'direct_select', options: { featureId: string }): this;
    changeMode(mode: 'simple_select', options?: { featureIds?: string[] }): this;
    changeMode(mode: DrawMode): this;
    getMode(): string;
    trash(): this;
  }

  export default MapboxDraw;
}
