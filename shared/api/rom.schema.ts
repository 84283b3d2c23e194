import '../model/zod-config';
import { z } from 'zod';

/** Upload fields beside the file: an optional name. */
export const romUploadFieldsSchema = z.strictObject({ name: z.string().trim().min(1).max(120).optional() });

/** Patch one entry of a stored image with a saved drive timing. */
export const romPatchSchema = z.strictObject({
  entryIndex: z
    .number({ message: 'entryIndex must be a whole number from 0 to 255' })
    .int({ message: 'entryIndex must be a whole number from 0 to 255' })
    .min(0, { message: 'entryIndex must be a whole number from 0 to 255' })
    .max(255, { message: 'entryIndex must be a whole number from 0 to 255' }),
  timingId: z.string().uuid({ message: 'timingId must be the id of a saved drive timing' }),
  /** Where the checksum byte goes; the last byte of the image when left out. */
  checksumAt: z
    .number()
    .int()
    .min(0)
    .max(512 * 1024 - 1)
    .optional(),
  /** Where the parameter table starts, when the image's own pointer is missing or wrong. */
  tableOffset: z
    .number()
    .int()
    .min(0)
    .max(512 * 1024 - 1)
    .optional(),
  /** The user confirms they start from an image that is itself a patch. */
  startFromPatched: z.boolean().optional(),
});
export type RomPatchBody = z.infer<typeof romPatchSchema>;

/** An image's query string: ?tableOffset= to read the parameter table at a given offset (decimal or 0x… hex). */
export const romDetailQuerySchema = z.object({
  tableOffset: z
    .string()
    .trim()
    .regex(/^$|^(0x[0-9a-f]+|\d+)$/i, { message: 'tableOffset must be a whole number (decimal or 0x… hex)' })
    .transform((raw) => (raw === '' ? undefined : Number(raw)))
    .optional(),
});
