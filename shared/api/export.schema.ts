import '../model/zod-config';
import { z } from 'zod';
import { MAX_SHEET_ARTWORKS, MAX_SHEET_CELLS, MAX_SHEET_LOOKS, SHEET_LAYOUTS, type SheetLayout } from '../export/sheet';
import { oneOf } from './fields.schema';
import { nameSchema } from './text.schema';

/**
 * A comparison sheet request: artworks of the studio × looks (a studio preset as "studio:<id>" at
 * its current revision, or a built-in preset id), a layout, the render scale and the animation
 * frame. An A/B sheet takes exactly two looks.
 */
export const sheetRequestSchema = z
  .strictObject({
    title: nameSchema(120).optional(),
    layout: z.enum(SHEET_LAYOUTS, { message: `layout must be one of ${SHEET_LAYOUTS.join(', ')}` }),
    artworkIds: z
      .array(z.uuid({ message: 'each artwork must be an artwork id' }))
      .min(1, { message: 'choose at least one artwork' })
      .max(MAX_SHEET_ARTWORKS, { message: `choose at most ${MAX_SHEET_ARTWORKS} artworks` })
      .refine((ids) => new Set(ids).size === ids.length, { message: 'each artwork may be chosen once' }),
    looks: z
      .array(z.string().min(1).max(100))
      .min(1, { message: 'choose at least one look' })
      .max(MAX_SHEET_LOOKS, { message: `choose at most ${MAX_SHEET_LOOKS} looks` })
      .refine((ids) => new Set(ids).size === ids.length, { message: 'each look may be chosen once' }),
    scale: z
      .int({ message: 'scale must be a whole number from 1 to 4' })
      .min(1, { message: 'scale must be a whole number from 1 to 4' })
      .max(4, { message: 'scale must be a whole number from 1 to 4' })
      .default(2),
    frame: z.int({ message: 'frame must be a whole number from 0' }).min(0, { message: 'frame must be a whole number from 0' }).default(0),
    /** Under each render: its legibility, light and power, as the bench's analysis computes them. */
    report: z.boolean({ message: 'report must be true or false' }).default(false),
  })
  .refine((r) => r.artworkIds.length * r.looks.length <= MAX_SHEET_CELLS, {
    message: `a sheet holds at most ${MAX_SHEET_CELLS} cells (artworks × looks)`,
    path: ['looks'],
  })
  .refine((r) => r.layout !== 'ab-diff' || r.looks.length === 2, { message: 'an A/B sheet compares exactly two looks', path: ['looks'] });
export type SheetRequest = z.infer<typeof sheetRequestSchema>;

/** Most frames an animated export renders. */
export const MAX_ANIMATION_FRAMES = 240;

/** An animated export: one animation of the studio through one look (with its persistence), as APNG and GIF. */
export const animationRequestSchema = z.strictObject({
  title: nameSchema(120).optional(),
  artworkId: z.uuid({ message: 'artworkId must be an artwork id' }),
  look: z.string().min(1, { message: 'choose a look' }).max(100),
  scale: z
    .int({ message: 'scale must be a whole number from 1 to 4' })
    .min(1, { message: 'scale must be a whole number from 1 to 4' })
    .max(4, { message: 'scale must be a whole number from 1 to 4' })
    .default(2),
  distanceMm: z
    .number({ message: 'distanceMm must be a number from 50 to 100000' })
    .min(50, { message: 'distanceMm must be a number from 50 to 100000' })
    .max(100_000, { message: 'distanceMm must be a number from 50 to 100000' })
    .default(600),
});
export type AnimationRequest = z.infer<typeof animationRequestSchema>;

/** The flash check of an animated export, as its manifest and the list state it. */
export interface ExportFlash {
  distanceMm: number;
  maxFlashesPerSecond: number;
  generalFlashFail: boolean;
  redFlashFail: boolean;
  bt1702Fail: boolean;
  pass: boolean;
}

/** A share link to an export: how long it works (none: until revoked). */
export const exportLinkSchema = z.strictObject({
  expiresInDays: z
    .int({ message: 'expiresInDays must be a whole number from 1 to 365' })
    .min(1, { message: 'expiresInDays must be a whole number from 1 to 365' })
    .max(365, { message: 'expiresInDays must be a whole number from 1 to 365' })
    .optional(),
});

/** A share link to an export; the URL only in the answer that made it (the token is stored hashed). */
export interface ExportLinkDto {
  id: string;
  url?: string;
  expiresAt: string | null;
  revokedAt: string | null;
  createdAt: string;
}

/** What an export's share link opens, read-only, without an account. */
export interface SharedExportDto {
  title: string;
  kind: ExportKind;
  layout: SheetLayout | null;
  studioName: string;
  createdAt: string;
  artworks: string[];
  looks: { name: string; revision: number | null; panelTypeName: string }[];
  width: number | null;
  height: number | null;
  figures: ExportDto['figures'];
  animation: ExportDto['animation'];
  /** A sheet's PNG, served through the link, to show on the page; null for animations (they are not played unasked). */
  previewUrl: string | null;
  files: { format: ExportFormat; label: string; url: string; bytes: number }[];
}

export const EXPORT_KINDS = ['sheet', 'animation'] as const;
export type ExportKind = (typeof EXPORT_KINDS)[number];
export const EXPORT_FORMATS = ['png', 'pdf', 'zip', 'apng', 'gif', 'json'] as const;
export type ExportFormat = (typeof EXPORT_FORMATS)[number];

export const EXPORT_STATUSES = ['queued', 'running', 'done', 'failed', 'cancelled'] as const;
export type ExportStatus = (typeof EXPORT_STATUSES)[number];
export const EXPORT_STATUS_LABELS: Readonly<Record<ExportStatus, string>> = {
  queued: 'Waiting',
  running: 'Rendering',
  done: 'Ready',
  failed: 'Failed',
  cancelled: 'Cancelled',
};

/** One export as the studio sees it. */
export interface ExportDto {
  id: string;
  title: string;
  kind: ExportKind;
  /** How a sheet is laid out; null for an animation. */
  layout: SheetLayout | null;
  status: ExportStatus;
  /** 0–1. */
  progress: number;
  /** What the job is doing now, in words ("Cell 3 of 4: Walk cycle through Soft glow"). */
  step: string;
  error: string | null;
  artworks: { id: string; name: string }[];
  looks: { id: string; name: string; revision: number | null; panelTypeName: string }[];
  scale: number;
  frame: number;
  cells: number;
  width: number | null;
  height: number | null;
  /** Whether each render carries its analysis (legibility, light and power). */
  report: boolean;
  /** A/B sheets: per artwork, pixels differing and the largest channel difference. */
  figures: { artworkName: string; differing: number; pixels: number; maxChannel: number }[] | null;
  /** Animations: frames rendered, and the flash check of what the panel emits. */
  animation: { frames: number; durationMs: number; flash: ExportFlash | null } | null;
  createdBy: { id: string | null; name: string };
  createdAt: string;
  finishedAt: string | null;
  /** The files to download once done: the sheet as PNG and PDF, the single renders with a manifest as ZIP. */
  files: { format: ExportFormat; label: string; url: string; bytes: number }[];
}

/** A download's query string: which of the export's files (png by default). */
export const exportFileQuerySchema = z.object({ format: oneOf('format', EXPORT_FORMATS).default('png') });
