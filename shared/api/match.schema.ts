import '../model/zod-config';
import { z } from 'zod';
import { FRAME_DATA_FORMATS } from '../drive/frame-data-formats';
import { oneOf } from './fields.schema';
import type { FittedValue, MatchResult } from '../match/fit';

/** The match pattern's download formats: the image, then frame data. */
export const PATTERN_FORMATS = ['png', ...FRAME_DATA_FORMATS] as const;

/** The pattern's query string: the look, and png (one pixel a cell) or a frame-data format. */
export const patternQuerySchema = z.object({
  look: z
    .string({ message: 'say which look the pattern is for: ?look=<built-in preset id or studio:<preset id>>' })
    .min(1, { message: 'say which look the pattern is for: ?look=<built-in preset id or studio:<preset id>>' })
    .max(100),
  format: oneOf('format', PATTERN_FORMATS).default('png'),
});

/** Form fields sent with a match photo (multipart field "file"). */
export const matchUploadSchema = z.strictObject({
  /** The look to start from: a built-in preset id, or studio:<preset id>. */
  look: z.string({ message: 'choose the look to start from' }).min(1, { message: 'choose the look to start from' }).max(100),
  /** The active area as measured on the panel, mm (default: the look's pitch × cells). */
  activeWidthMm: z.coerce
    .number({ message: 'active width must be a number of millimetres' })
    .min(1, { message: 'active width must be from 1 to 2000 mm' })
    .max(2000, { message: 'active width must be from 1 to 2000 mm' })
    .optional(),
  activeHeightMm: z.coerce
    .number({ message: 'active height must be a number of millimetres' })
    .min(1, { message: 'active height must be from 1 to 2000 mm' })
    .max(2000, { message: 'active height must be from 1 to 2000 mm' })
    .optional(),
  /** The camera's curve: sRGB (every camera's JPEG), or a stated gamma. */
  cameraGamma: z.coerce
    .number({ message: 'camera gamma must be a number from 1 to 3' })
    .min(1, { message: 'camera gamma must be a number from 1 to 3' })
    .max(3, { message: 'camera gamma must be a number from 1 to 3' })
    .optional(),
});
export type MatchUpload = z.infer<typeof matchUploadSchema>;

const point = z.tuple([
  z.number({ message: 'each mark is [x, y] in photo pixels' }),
  z.number({ message: 'each mark is [x, y] in photo pixels' }),
]);
/** The four marks, photo pixels: top-left, top-right, bottom-right, bottom-left. */
export const matchMarksSchema = z.strictObject({ marks: z.array(point).length(4, { message: 'place exactly four marks' }) });

/** Take the measured level curve as the preset's duty table (level spacing "Duty table"). */
const levelCurve = z.boolean({ message: 'levelCurve must be true or false' }).optional();

/** Saving a fit: as a new studio preset (a name), or as a new revision of the studio preset it started from. */
export const matchSaveSchema = z.union(
  [
    z.strictObject({
      name: z.string().trim().min(1, { message: 'give the preset a name' }).max(80, { message: 'a preset name has at most 80 characters' }),
      levelCurve,
    }),
    z.strictObject({ revisionOfLook: z.literal(true, { message: 'revisionOfLook must be true' }), levelCurve }),
  ],
  { message: 'give a name for a new preset, or revisionOfLook: true for a new revision of the starting preset' },
);

export const MATCH_STATUSES = ['marking', 'queued', 'running', 'done', 'failed'] as const;
export type MatchStatus = (typeof MATCH_STATUSES)[number];
export const MATCH_STATUS_LABELS: Readonly<Record<MatchStatus, string>> = {
  marking: 'Waiting for marks',
  queued: 'Waiting for a worker',
  running: 'Fitting',
  done: 'Fitted',
  failed: 'Could not fit',
};

/** A fit's result as the API shows it (the images are separate downloads). */
export type MatchResultDto = Pick<MatchResult, 'parameters' | 'levels' | 'quality' | 'cameraBlurMm' | 'notDetermined' | 'marks'> & {
  fitted: FittedValue[];
};

export interface MatchDto {
  id: string;
  look: { id: string; name: string; panelTypeId: string; panelTypeName: string };
  photo: { width: number; height: number; fileName: string };
  activeWidthMm: number;
  activeHeightMm: number;
  cameraGamma: number | null;
  marks: [number, number][] | null;
  status: MatchStatus;
  statusLabel: string;
  progress: number;
  step: string;
  error: string | null;
  result: MatchResultDto | null;
  savedPresetId: string | null;
  createdBy: { id: string; name: string } | null;
  createdAt: string;
}
