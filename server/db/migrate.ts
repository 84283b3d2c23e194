import path from 'node:path';
import type { Sequelize } from 'sequelize';
import { SequelizeStorage, Umzug } from 'umzug';

/** Applies pending migrations from server/db/migrations (names recorded without extension). */
export async function migrate(sequelize: Sequelize): Promise<string[]> {
  const umzug = new Umzug({
    migrations: {
      glob: ['migrations/*.{ts,js}', { cwd: __dirname, ignore: ['**/*.d.ts', '**/*.spec.*'] }],
      resolve: ({ name, path: file, context }) => {
        // eslint-disable-next-line @typescript-eslint/no-require-imports -- a migration file found at run time, loaded through tsx's CommonJS hook
        const migration = require(file!);
        return {
          name: path.basename(name, path.extname(name)),
          up: async () => migration.up(context),
          down: async () => migration.down?.(context),
        };
      },
    },
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger: undefined,
  });
  // One migrator at a time even when several processes start together.
  return sequelize.transaction(async (t) => {
    await sequelize.query('SELECT pg_advisory_xact_lock(424242)', { transaction: t });
    const done = await umzug.up();
    return done.map((m) => m.name);
  });
}
