import { QueryTypes } from 'sequelize';
import { Prescription } from '../../db/associations';
import { getLog } from './log.service';
import { CELL_ZOOMS, CELLS_PER_TILE as CELL_COLUMNS, TILE_EXTENT } from '../../../shared/audit/tile-cells';
import type { Actor } from '../../types';

/**
 * Whether the log has cells at zoom z: logs read before the cells existed (or before zoom 18 had them) have
 * none there until they are read again, and those tiles come from the points.
 */
async function hasCells(logId: string, z: number) {
  const [row] = await Prescription.sequelize!.query<{ has: boolean }>(
    'SELECT EXISTS (SELECT 1 FROM as_applied_cells WHERE log_id = :logId AND z = :z) AS has',
    { replacements: { logId, z }, type: QueryTypes.SELECT },
  );
  return row.has;
}

/**
 * Zooms whose tiles show the cells of the zoom above (a quarter of its tile, 64 cells a side instead of 128):
 * there one field fills one or two whole tiles, and 128 × 128 cells made tiles of 300 KB and 50–100 ms.
 */
const COARSE_ZOOMS = new Set([13, 14, 15]);

/**
 * A tile at zooms 12–18 from the cells averaged at import (shared/audit/tile-cells.ts), already in tile
 * coordinates: at most 128 × 128 points, read through an index; values single precision, errors computed
 * at import (migration 0010).
 */
async function cellTile(logId: string, z: number, x: number, y: number): Promise<Buffer> {
  const coarse = COARSE_ZOOMS.has(z);
  const side = coarse ? CELL_COLUMNS / 2 : CELL_COLUMNS;
  const size = TILE_EXTENT / side;
  const [ox, oy] = coarse ? [(x & 1) * side, (y & 1) * side] : [0, 0];
  const [row] = await Prescription.sequelize!.query<{ tile: Buffer | null }>(
    `SELECT ST_AsMVT(q, 'points', ${TILE_EXTENT}, 'g') AS tile FROM (
       SELECT ST_MakePoint((c.gx - :ox) * ${size} + ${size / 2}, (c.gy - :oy) * ${size} + ${size / 2}) AS g,
              c.err, c.true_err, c.applied, c.target, c.speed, c.n
         FROM as_applied_cells c
        WHERE c.log_id = :logId AND c.z = :cz AND c.tx = :cx AND c.ty = :cy
          AND c.gx >= :ox AND c.gx < :ox + ${side} AND c.gy >= :oy AND c.gy < :oy + ${side}) q`,
    {
      replacements: {
        logId,
        cz: coarse ? z - 1 : z,
        cx: coarse ? x >> 1 : x,
        cy: coarse ? y >> 1 : y,
        ox,
        oy,
      },
      type: QueryTypes.SELECT,
    },
  );
  return row?.tile ?? Buffer.alloc(0);
}

/** Web Mercator world width, m (EPSG:3857). */
const WORLD_M = 40_075_016.68557849;
/** One aggregated point per tile pixel of a 256-pixel tile (PERFORMANCE.md: thin by zoom). */
const CELLS_PER_TILE = 256;

/**
 * A Mapbox vector tile of a log's kept points, from PostGIS (ST_AsMVT), thinned to one averaged point per
 * tile pixel, so a million points stay smooth at every zoom. Properties: err (logged applied vs target, %),
 * true_err (the same after the speed-source correction, % — absent without both speeds), applied and
 * target (SI), speed (GNSS, else wheel, m/s).
 */
export async function logTile(actor: Actor, logId: string, z: number, x: number, y: number): Promise<Buffer> {
  const log = await getLog(actor, logId);
  // A log's tiles do not change until it is read again, which moves its version: kept by (log, version).
  const key = `${logId}:${log.version}:${z}/${x}/${y}`;
  const kept = recentTiles.get(key);
  if (kept) return kept;
  const tile = await makeTile(logId, z, x, y);
  recentTiles.set(key, tile);
  return tile;
}

/**
 * The tiles made lately, least recently used first out, within a memory budget: the audit page's maps ask
 * for the same tiles (the error map and the rate map share them), and so does a map panned back. Scope is
 * checked before (getLog), so a kept tile only reaches someone who may read the log.
 */
export class TileMemory {
  private tiles = new Map<string, Buffer>();
  private bytes = 0;
  constructor(private readonly maxBytes: number) {}

  get(key: string) {
    const t = this.tiles.get(key);
    if (t) {
      this.tiles.delete(key);
      this.tiles.set(key, t);
    }
    return t;
  }

  set(key: string, tile: Buffer) {
    if (tile.length > this.maxBytes) return;
    const before = this.tiles.get(key);
    if (before) this.bytes -= before.length;
    this.tiles.set(key, tile);
    this.bytes += tile.length;
    for (const [k, t] of this.tiles) {
      if (this.bytes <= this.maxBytes) break;
      this.tiles.delete(k);
      this.bytes -= t.length;
    }
  }
}

const recentTiles = new TileMemory(64 * 1024 * 1024);

async function makeTile(logId: string, z: number, x: number, y: number): Promise<Buffer> {
  if (
    (CELL_ZOOMS as readonly number[]).includes(z) &&
    (await hasCells(logId, COARSE_ZOOMS.has(z) ? z - 1 : z))
  )
    return cellTile(logId, z, x, y);
  const cell = WORLD_M / 2 ** z / CELLS_PER_TILE;
  const [row] = await Prescription.sequelize!.query<{ tile: Buffer | null }>(
    `WITH env AS (SELECT ST_TileEnvelope(:z, :x, :y) AS e),
          box AS (SELECT ST_Transform(e, 4326) AS e4 FROM env),
          pts AS (
            SELECT ST_Transform(p.geom, 3857) AS g, p.target, p.applied, p.applied_true,
                   COALESCE(p.gnss_mps, p.wheel_mps) AS speed
              FROM as_applied_points p, box
             WHERE p.log_id = :logId AND p.removed_by = 0 AND p.geom && box.e4),
          cells AS (
            SELECT ST_SnapToGrid(g, :cell) AS g, avg(target) AS target, avg(applied) AS applied,
                   avg(applied_true) AS applied_true, avg(speed) AS speed, count(*) AS n
              FROM pts GROUP BY 1)
     SELECT ST_AsMVT(q, 'points', 4096, 'g') AS tile FROM (
       SELECT ST_AsMVTGeom(c.g, env.e, 4096, 16, true) AS g,
              round((100 * (c.applied - c.target) / NULLIF(c.target, 0))::numeric, 2)::float8 AS err,
              round((100 * (c.applied_true - c.target) / NULLIF(c.target, 0))::numeric, 2)::float8 AS true_err,
              c.applied::float8 AS applied, c.target::float8 AS target, c.speed::float8 AS speed, c.n::int AS n
         FROM cells c, env) q
      WHERE q.g IS NOT NULL`,
    { replacements: { logId, z, x, y, cell }, type: QueryTypes.SELECT },
  );
  return row?.tile ?? Buffer.alloc(0);
}
