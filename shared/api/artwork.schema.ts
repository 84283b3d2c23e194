import '../model/zod-config';
import { z } from 'zod';
import { oneOf, searchText, whole } from './fields.schema';
import { nameSchema } from './text.schema';

/** Multipart text fields of an upload: an optional name and, for a sprite sheet, its grid. */
export const uploadFieldsSchema = z
  .strictObject({
    name: nameSchema(120).optional(),
    frameWidth: whole('frameWidth', 1, 4096).optional(),
    frameHeight: whole('frameHeight', 1, 4096).optional(),
    frameDelayMs: whole('frameDelayMs', 20, 10000).optional(),
  })
  .refine((f) => (f.frameWidth === undefined) === (f.frameHeight === undefined), {
    message: 'give both frameWidth and frameHeight for a sprite sheet, or neither',
    path: ['frameWidth'],
  });

export const renameArtworkSchema = z.strictObject({ name: nameSchema(120) });

export const ARTWORK_SORTS = ['newest', 'oldest', 'name'] as const;

/** The library's query string: ?q= (part of a name) and ?sort=. */
export const artworkListQuerySchema = z.object({
  q: searchText(120).optional(),
  sort: oneOf('sort', ARTWORK_SORTS).default('newest'),
});

/** A studio render request: an artwork of the studio with a preset (and patch) or full parameters. */
export const studioRenderSchema = z
  .strictObject({
    artworkId: z.uuid({ message: 'artworkId must be an artwork id' }),
    presetId: z.string().max(100).optional(),
    parameters: z.unknown().optional(),
    patch: z.unknown().optional(),
    scale: whole('scale', 1, 8).default(3),
    frame: whole('frame', 0, 100000).default(0),
  })
  .refine((f) => (f.presetId ? 1 : 0) + (f.parameters !== undefined ? 1 : 0) === 1, {
    message: 'give either presetId (optionally with patch) or parameters',
    path: ['presetId'],
  });
