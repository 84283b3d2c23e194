import { BUILT_IN_PRESETS, PANEL_TYPES } from '@shared/model/panel-types';
import { PARAMS } from '@shared/model/parameters';
import { ApiRouter } from '../../core/api-router';
import { publicAccess } from '../../core/policy';

/** /api/panel-types: the built-in panel types, their presets and the parameter table. */
export function panelTypesRoutes(): ApiRouter {
  const api = new ApiRouter('/panel-types', 'Panel model');
  api.route(
    'get',
    '/',
    { policy: publicAccess, summary: 'Built-in panel types with their built-in presets, and the parameter table' },
    (_req, res) => {
      res.set('Cache-Control', 'public, max-age=300');
      res.json({
        panelTypes: PANEL_TYPES.map((t) => ({ ...t, presets: BUILT_IN_PRESETS.filter((p) => p.panelTypeId === t.id) })),
        parameters: PARAMS,
      });
    },
  );
  return api;
}
