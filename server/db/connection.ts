import { Sequelize } from 'sequelize';
import type { Config } from '../config';

/**
 * Creates the Sequelize instance. The pool fails fast when PostgreSQL is away (connect and
 * acquire timeouts) so requests answer 503 instead of hanging, and recovers by itself.
 */
export function createSequelize(db: Config['db']): Sequelize {
  const sequelize = new Sequelize(db.database, db.user, db.password ?? '', {
    host: db.host,
    port: db.port,
    dialect: 'postgres',
    logging: false,
    define: { underscored: true },
    dialectOptions: { connectionTimeoutMillis: 2000, statement_timeout: 15000 },
    pool: { max: db.poolMax, min: 0, acquire: 3000, idle: 10000, evict: 1000 },
    retry: { max: 0 },
  });
  return sequelize;
}
