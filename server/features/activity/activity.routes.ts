import type { ActivityDto } from '@shared/api/dto';
import { activityQuerySchema } from '@shared/api/studio.schema';
import { ApiRouter } from '../../core/api-router';
import { studioRole } from '../../core/policy';
import { displayNames } from '../auth/display-names';
import { Activity } from './activity.model';

/** /api/studios/:studioId/activity: the studio's feed, newest first. */
export function activityRoutes(): ApiRouter {
  const api = new ApiRouter('/studios/:studioId/activity', 'Studios');
  api.route(
    'get',
    '/',
    { policy: studioRole('viewer'), summary: 'What happened in the studio, newest first', query: activityQuerySchema },
    async (req, res) => {
      const rows = await Activity.findAll({
        where: { studioId: req.membership.studioId },
        order: [
          ['createdAt', 'DESC'],
          ['id', 'DESC'],
        ],
        limit: req.query.limit,
      });
      const who = await displayNames(rows.map((r) => r.actorId));
      const activity: ActivityDto[] = rows.map((r) => ({
        id: Number(r.id),
        kind: r.kind,
        summary: r.summary,
        actor: r.actorId ? (who.get(r.actorId) ?? null) : null,
        createdAt: r.createdAt.toISOString(),
      }));
      res.json({ activity });
    },
  );
  return api;
}
