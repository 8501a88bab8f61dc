import { QueryTypes, type Sequelize } from 'sequelize';

/** Refuses to start when the database could lose committed data (RELIABILITY.md: nothing lost). */
export async function assertDurable(sequelize: Sequelize) {
  const bad: string[] = [];
  for (const setting of ['fsync', 'synchronous_commit', 'full_page_writes']) {
    const [row] = await sequelize.query<{ v: string }>(`SELECT current_setting('${setting}') AS v`, {
      type: QueryTypes.SELECT,
    });
    if (row?.v !== 'on') bad.push(`${setting}=${row?.v}`);
  }
  if (bad.length)
    throw new Error(
      `PostgreSQL must run with ${bad.map((b) => b.split('=')[0]).join(', ')} on (now ${bad.join(', ')})`,
    );
}
