import '../model/zod-config';
import { z } from 'zod';
import { whole } from './fields.schema';
import { panelParamsPatchSchema, panelParamsSchema } from '../model/parameters';

/**
 * The fields of a render request (multipart text fields, so numbers arrive as strings):
 * a built-in preset, optionally patched, or full inline parameters.
 */
export const renderFieldsSchema = z
  .strictObject({
    presetId: z.string().max(100).optional(),
    parameters: z.string().max(20_000).optional(),
    patch: z.string().max(20_000).optional(),
    scale: whole('scale', 1, 8).default(3),
    frame: whole('frame', 0, 100000).default(0),
  })
  .refine((f) => (f.presetId ? 1 : 0) + (f.parameters ? 1 : 0) === 1, {
    message: 'give either presetId (optionally with patch) or parameters',
    path: ['presetId'],
  });

export { panelParamsPatchSchema, panelParamsSchema };

/** What POST /api/renders answers. */
export interface RenderDto {
  key: string;
  url: string;
  width: number;
  height: number;
  cached: boolean;
}
