import type { Sequelize } from 'sequelize';
import { ApiRouter } from '../../core/api-router';
import { databaseUnavailable } from '../../core/error-handler';
import { publicAccess } from '../../core/policy';

/** /api/health: the process is up and the database answers (503 when it does not). */
export function healthRoutes(sequelize: Sequelize): ApiRouter {
  const api = new ApiRouter('/health', 'Service');
  api.route('get', '/', { policy: publicAccess, summary: 'Liveness and database reachability' }, async (_req, res) => {
    const started = Date.now();
    try {
      await sequelize.query('SELECT 1');
      res.json({ status: 'ok', database: 'up', databaseMs: Date.now() - started });
    } catch {
      databaseUnavailable(res);
    }
  });
  return api;
}
