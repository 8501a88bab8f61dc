import { Sequelize } from 'sequelize';
import pg from 'pg';

// node-postgres returns bigint (int8) and numeric as strings; counts come back as int8.
pg.types.setTypeParser(20, (v) => Number.parseInt(v, 10));
pg.types.setTypeParser(1700, (v) => Number.parseFloat(v));

/**
 * One Sequelize instance per process. Error listeners on the pool and on each client keep a database
 * restart from killing the process (RELIABILITY.md).
 */
export function createSequelize(url: string, { logging = false }: { logging?: boolean } = {}) {
  const sequelize = new Sequelize(url, {
    dialect: 'postgres',
    dialectModule: pg,
    logging: logging ? console.log : false,
    pool: { max: 20, min: 2, idle: 10_000, acquire: 30_000 },
    define: { underscored: true },
    hooks: {
      afterConnect(connection: unknown) {
        const client = connection as pg.Client;
        client.on('error', (err) => {
          console.warn(`[db] connection error: ${err.message}`);
        });
      },
    },
  });
  return sequelize;
}
