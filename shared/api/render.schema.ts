import '../model/zod-config';
import { z } from 'zod';
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
    scale: z.coerce
      .number({ message: 'scale must be a whole number from 1 to 8' })
      .int({ message: 'scale must be a whole number from 1 to 8' })
      .min(1, { message: 'scale must be a whole number from 1 to 8' })
      .max(8, { message: 'scale must be a whole number from 1 to 8' })
      .default(3),
    frame: z.coerce
      .number({ message: 'frame must be a whole number from 0' })
      .int({ message: 'frame must be a whole number from 0' })
      .min(0, { message: 'frame must be a whole number from 0' })
      .default(0),
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
