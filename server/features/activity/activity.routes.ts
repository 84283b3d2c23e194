import type { ActivityDto } from '../../../shared/api/dto';
import { ApiRouter } from '../../core/api-router';
import { studioRole } from '../../core/policy';
import { User } from '../auth/user.model';
import { Activity } from './activity.model';

/** /api/studios/:studioId/activity: the studio's feed, newest first. */
export function activityRoutes(): ApiRouter {
  const api = new ApiRouter('/studios/:studioId/activity', 'Studios');
  api.route(
    'get',
    '/',
    { policy: studioRole('viewer'), summary: 'What happened in the studio, newest first (?limit= up to 200)' },
    async (req, res) => {
      const limit = Math.min(200, Math.max(1, Number(req.query.limit ?? 50) | 0));
      const rows = await Activity.findAll({
        where: { studioId: req.membership!.studioId },
        order: [
          ['createdAt', 'DESC'],
          ['id', 'DESC'],
        ],
        limit,
      });
      const ids = [...new Set(rows.map((r) => r.actorId).filter((i): i is string => !!i))];
      const who = new Map(
        (ids.length ? await User.findAll({ where: { id: ids }, attributes: ['id', 'displayName'] }) : []).map((u) => [u.id, u.displayName]),
      );
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
