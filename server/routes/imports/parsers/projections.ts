import proj4 from 'proj4';

/**
 * proj4 definitions of the coordinate systems Sowright reprojects from by EPSG code. proj4 itself knows
 * EPSG:4326, 4269 and 3857; the UTM families below are defined from their EPSG parameters (zone, hemisphere,
 * datum): WGS 84 / UTM 326zz (north) and 327zz (south), NAD83 / UTM 269zz (zones 1–23), ETRS89 / UTM 258zz
 * (zones 28–38), GDA94 / MGA 283zz (zones 48–58). NAD83, ETRS89 and GDA94 are taken as WGS84 (they differ by
 * about a metre, less than a field's GNSS error: common practice).
 */
export function projectionFor(code: string): string | null {
  const m = /^EPSG:(\d{4,6})$/.exec(code);
  if (!m) return null;
  const n = Number(m[1]);
  if (n === 4326 || n === 4269 || n === 4258 || n === 4283) return '+proj=longlat +datum=WGS84 +no_defs';
  if (n === 3857 || n === 900913 || n === 3785)
    return '+proj=merc +a=6378137 +b=6378137 +lat_ts=0 +lon_0=0 +x_0=0 +y_0=0 +k=1 +units=m +nadgrids=@null +no_defs';
  const utm = (zone: number, south: boolean) =>
    `+proj=utm +zone=${zone} ${south ? '+south ' : ''}+datum=WGS84 +units=m +no_defs`;
  if (n >= 32601 && n <= 32660) return utm(n - 32600, false);
  if (n >= 32701 && n <= 32760) return utm(n - 32700, true);
  if (n >= 26901 && n <= 26923) return utm(n - 26900, false);
  if (n >= 25828 && n <= 25838) return utm(n - 25800, false);
  if (n >= 28348 && n <= 28358) return utm(n - 28300, true);
  return null;
}

export const isGeographicCode = (code: string) => /^EPSG:(4326|4269|4258|4283)$/.test(code);

/** A function taking [x, y] in `code` to [lon, lat] WGS84; null when Sowright does not know the code. */
export function toWgs84(code: string): ((p: number[]) => number[]) | null {
  const def = projectionFor(code);
  if (!def) return null;
  const conv = proj4(def, 'EPSG:4326');
  return (p) => conv.forward([p[0], p[1]]);
}
