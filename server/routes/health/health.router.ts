import { Router } from 'express';
import { QueryTypes, type Sequelize } from 'sequelize';
import { pipelineWorkerState } from '../../logs/pipeline-runner';

export function healthRouter(sequelize: Sequelize, version: string) {
  const router = Router();
  router.get('/', async (_req, res) => {
    try {
      const [row] = await sequelize.query<{ postgis: string }>('SELECT postgis_lib_version() AS postgis', {
        type: QueryTypes.SELECT,
      });
      res.json({
        status: 'ok',
        version,
        database: 'reachable',
        postgis: row?.postgis ?? null,
        // The log reader's thread: `starting` for a few seconds after start while it loads and warms up.
        logReader: pipelineWorkerState(),
      });
    } catch {
      res.status(503).json({ status: 'degraded', version, database: 'unreachable', postgis: null });
    }
  });
  return router;
}
