import { createTimingSchema, timingListQuerySchema, updateTimingSchema } from '@shared/api/timing.schema';
import { ApiRouter } from '../../core/api-router';
import { idParam, studioRole } from '../../core/policy';
import type { TimingsService } from './timings.service';

/** /api/studios/:studioId/timings: saved drive timings (viewers read, editors change). */
export function timingsRoutes(timings: TimingsService): ApiRouter {
  const api = new ApiRouter('/studios/:studioId/timings', 'Drive timing');
  api.route(
    'get',
    '/',
    { policy: studioRole('viewer'), summary: "The studio's saved timings (optionally one panel type's)", query: timingListQuerySchema },
    async (req, res) => {
      res.json({ timings: await timings.list(req.membership.studioId, req.query.panelTypeId) });
    },
  );
  api.route(
    'post',
    '/',
    { policy: studioRole('editor'), summary: 'Save a timing for a panel type', body: createTimingSchema, status: 201 },
    async (req, res) => {
      res.status(201).json({ timing: await timings.create(req.membership.studioId, req.user.id, req.body) });
    },
  );
  api.route(
    'get',
    '/:timingId',
    { policy: studioRole('viewer'), summary: 'One saved timing with its figures, registers input and warnings' },
    async (req, res) => {
      res.json({ timing: await timings.get(req.membership.studioId, idParam(req, 'timingId', 'The timing')) });
    },
  );
  api.route(
    'patch',
    '/:timingId',
    { policy: studioRole('editor'), summary: 'Change a saved timing', body: updateTimingSchema },
    async (req, res) => {
      res.json({ timing: await timings.update(req.membership.studioId, idParam(req, 'timingId', 'The timing'), req.user.id, req.body) });
    },
  );
  api.route('delete', '/:timingId', { policy: studioRole('editor'), summary: 'Delete a saved timing', status: 204 }, async (req, res) => {
    await timings.remove(req.membership.studioId, idParam(req, 'timingId', 'The timing'));
    res.status(204).end();
  });
  return api;
}
