import { loadConfig } from '../config';
import { createSequelize } from '../db/connection';
import { migrate } from '../db/migrate';

/** Once per jest run: migrate the test database (scripts/test.mjs created it empty). */
export default async function globalSetup(): Promise<void> {
  process.env.DB_NAME ??= 'emberline_test';
  const sequelize = createSequelize(loadConfig().db);
  try {
    await migrate(sequelize);
  } finally {
    await sequelize.close();
  }
}
