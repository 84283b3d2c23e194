import '../model/zod-config';
import { z } from 'zod';
import { panelParamsSchema, withAddedKeys } from '../model/parameters';
import { oneOf, searchText, whole } from './fields.schema';
import { nameSchema, noteSchema } from './text.schema';

const name = nameSchema(80);

export const createPresetSchema = z.strictObject({
  name,
  panelTypeId: z.string().max(100),
  parameters: panelParamsSchema.optional(),
});

export const updatePresetSchema = z.strictObject({
  baseRevision: z.number({ message: 'baseRevision must be the revision you edited' }).int().min(1),
  name: name.optional(),
  parameters: panelParamsSchema.optional(),
  message: noteSchema(500).optional(),
});

export const duplicatePresetSchema = z.strictObject({
  studioId: z.uuid({ message: 'studioId must be a studio id' }),
  name: name.optional(),
});
export const referenceSchema = z.strictObject({ isReference: z.boolean() });
export const restoreSchema = z.strictObject({ message: noteSchema(500).optional() });

export const shareLinkSchema = z.strictObject({
  artworkId: z.uuid({ message: 'artworkId must be an artwork id' }).optional(),
  expiresInDays: z
    .number()
    .int({ message: 'expiresInDays must be a whole number from 1 to 365' })
    .min(1, { message: 'expiresInDays must be a whole number from 1 to 365' })
    .max(365, { message: 'expiresInDays must be a whole number from 1 to 365' })
    .optional(),
});

/** Emberline's own preset document format, for export and import. */
export const PRESET_FORMAT = 'emberline.preset';
export const presetDocumentSchema = z.strictObject({
  format: z.literal(PRESET_FORMAT, { message: `format must be "${PRESET_FORMAT}"` }),
  version: z.literal(1, { message: 'version must be 1' }),
  name,
  panelTypeId: z.string().max(100),
  // A file written before a parameter existed gets that parameter's stated value.
  parameters: z.preprocess(withAddedKeys, panelParamsSchema),
});
export type PresetDocument = z.infer<typeof presetDocumentSchema>;

export const PRESET_SORTS = ['name', '-name', 'updated', '-updated'] as const;

/** The preset list's query string: filter, search, order and page. */
export const presetListQuerySchema = z.object({
  panelTypeId: z.string({ message: 'give one panelTypeId' }).max(80).optional(),
  q: searchText(80).optional(),
  sort: oneOf('sort', PRESET_SORTS).default('-updated'),
  page: whole('page', 0, 100_000).default(0),
  pageSize: whole('pageSize', 1, 100).default(25),
});

/** A thumbnail's query string: the artwork to show the preset on (default the newest). */
export const presetThumbnailQuerySchema = z.object({ artworkId: z.string({ message: 'give one artworkId' }).optional() });
