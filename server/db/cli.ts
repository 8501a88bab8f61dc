import { createSequelize } from './sequelize';
import { createMigrator, createSeeder } from './umzug';
import { initModels } from './associations';

/** `tsx server/db/cli.ts migrate|seed|reset|down` against DATABASE_URL. */
async function main() {
  const command = process.argv[2] ?? 'migrate';
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error('DATABASE_URL is not set');
  const sequelize = createSequelize(url);
  initModels(sequelize);
  try {
    const migrator = createMigrator(sequelize);
    const seeder = createSeeder(sequelize);
    if (command === 'reset') {
      await seeder.down({ to: 0 });
      await migrator.down({ to: 0 });
    }
    if (command === 'down') {
      await migrator.down();
      return;
    }
    const done = await migrator.up();
    if (done.length) process.stdout.write(`[db] migrated: ${done.map((m) => m.name).join(', ')}\n`);
    if (command === 'seed' || command === 'reset') {
      const seeded = await seeder.up();
      process.stdout.write(
        seeded.length
          ? `[db] seeded: ${seeded.map((s) => s.name).join(', ')}\n`
          : '[db] demo already seeded\n',
      );
    }
  } finally {
    await sequelize.close();
  }
}

main().catch((err: Error) => {
  process.stderr.write(`[db] ${err.stack ?? err.message}\n`);
  process.exit(1);
});
