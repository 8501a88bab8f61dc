import { Umzug, SequelizeStorage } from 'umzug';
import type { Sequelize } from 'sequelize';
import { fileURLToPath, pathToFileURL } from 'node:url';
import path from 'node:path';

export type MigrationContext = { context: Sequelize };

const here = path.dirname(fileURLToPath(import.meta.url));

/** Loads a `.ts` migration through our own dynamic import, so it works under tsx and vitest alike. */
function resolver(params: { name: string; path?: string; context: Sequelize }) {
  const file = params.path!;
  return {
    name: params.name.replace(/\.(ts|js)$/, ''),
    up: async () => (await import(pathToFileURL(file).href)).up({ context: params.context }),
    down: async () => (await import(pathToFileURL(file).href)).down({ context: params.context }),
  };
}

export function createMigrator(sequelize: Sequelize) {
  return new Umzug({
    migrations: { glob: ['migrations/*.{ts,js}', { cwd: here }], resolve: resolver },
    context: sequelize,
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger: undefined,
  });
}

export function createSeeder(sequelize: Sequelize) {
  return new Umzug({
    migrations: { glob: ['seeders/*.{ts,js}', { cwd: here }], resolve: resolver },
    context: sequelize,
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_seeds' }),
    logger: undefined,
  });
}
