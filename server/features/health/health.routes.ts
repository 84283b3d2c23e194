import type { Sequelize } from 'sequelize';
import { ApiRouter } from '../../core/api-router';
import { databaseUnavailable } from '../../core/error-handler';
import { publicAccess } from '../../core/policy';
import { ReadCache } from '../../core/read-cache';

/** How long one successful database probe answers health checks (a failed one is never kept). */
export const HEALTH_PROBE_MS = 1_000;

/**
 * /api/health: the process is up and the database answers (503 when it does not). Checks that
 * arrive together share one probe, and a good probe stands for a second, so a monitor polling
 * hard cannot take connections from the requests it watches.
 */
export function healthRoutes(sequelize: Sequelize): ApiRouter {
  const api = new ApiRouter('/health', 'Service');
  const probes = new ReadCache<number>('health', HEALTH_PROBE_MS, { maxEntries: 1 });
  const probe = () =>
    probes.read('database', async () => {
      const started = Date.now();
      await sequelize.query('SELECT 1');
      return Date.now() - started;
    });
  api.route('get', '/', { policy: publicAccess, summary: 'Liveness and database reachability' }, async (_req, res) => {
    try {
      res.json({ status: 'ok', database: 'up', databaseMs: await probe() });
    } catch {
      databaseUnavailable(res);
    }
  });
  return api;
}
