import sharp, { type Metadata } from 'sharp';
import { Op } from 'sequelize';
import { MATCH_STATUS_LABELS, type MatchDto, type MatchStatus, type MatchUpload } from '@shared/api/match.schema';
import { MatchRefusal } from '@shared/match/fit';
import { dutyTableFromLevels } from '@shared/match/level-curve';
import { checkMarks, MarkError, type Point } from '@shared/match/homography';
import { patternFor, patternImage, type MatchLayout } from '@shared/match/pattern';
import { DEFAULT_FRAME_LAYOUT, frameData, type FrameData } from '@shared/drive/frame-data';
import { levelCount } from '@shared/pipeline/levels/spacing';
import { encodeFrameData, FRAME_DATA_FORMAT_INFO, type FrameDataFormat } from '@shared/drive/frame-data-formats';
import type { PanelParams } from '@shared/model/parameters';
import type { RgbaImage } from '@shared/pipeline/types';
import type { Rectified } from '@shared/match/photo';
import type { Role } from '@shared/model/roles';
import { AppError, forbidden, notFound } from '../../core/app-error';
import { QUEUES, type JobQueue } from '../../jobs/job-queue';
import { encodePng } from '../../render/encode';
import type { RenderEngine } from '../../render/render-engine';
import type { BlobStore } from '../../storage/blob-store';
import { record } from '../activity/activity.model';
import { displayNames } from '../auth/display-names';
import { resolveLook } from '../presets/looks';
import { Preset } from '../presets/preset.model';
import type { PresetsService } from '../presets/presets.service';
import { PanelMatch } from './match.model';

/** Smallest photo accepted, pixels (the pattern needs at least 2 photo pixels a cell). */
export const MIN_PHOTO = { width: 640, height: 480 };
/** Largest photo accepted, pixels (a 60-megapixel camera). */
export const MAX_PHOTO_PIXELS = 60_000_000;

export interface MatchActor {
  studioId: string;
  userId: string;
  role: Role;
}

/** What the match job carries: the row is the whole request. */
export interface MatchJob {
  matchId: string;
}

const photoKey = (id: string) => `matches/${id}/photo`;
const residualKey = (id: string) => `matches/${id}/residual.png`;

/**
 * Panel matches: a photo of the match pattern is uploaded against a look, the user places the four
 * marks, and a background job fits the panel on the render pool (shared/match/fit.ts), writing its
 * progress into the row. The result can be saved as a studio preset.
 */
export class MatchesService {
  constructor(
    private readonly blobs: BlobStore,
    private readonly engine: RenderEngine,
    private readonly jobs: JobQueue,
    private readonly presets: PresetsService,
  ) {}

  /**
   * The match pattern of a look: a PNG of one pixel a cell, or frame data (raw binary, Intel HEX or
   * a C header) that drives each cell at its pattern level, packed at the fewest bits a cell that
   * hold the look's gray levels.
   */
  async pattern(
    studioId: string,
    look: string,
    format: 'png' | FrameDataFormat = 'png',
  ): Promise<{ bytes: Buffer; fileName: string; contentType: string }> {
    const spec = await resolveLook(studioId, look, 'look');
    let layout: MatchLayout;
    try {
      layout = patternFor(spec.parameters);
    } catch (err) {
      throw new AppError(400, 'invalid_input', (err as Error).message);
    }
    const image = patternImage(layout);
    const name = `match-pattern-${layout.cols}x${layout.rows}`;
    if (format === 'png') return { bytes: await encodePng(image), fileName: `${name}.png`, contentType: 'image/png' };
    const levels = levelCount(spec.parameters.drive);
    const bitsPerCell = levels <= 2 ? 1 : levels <= 4 ? 2 : 4;
    let data: FrameData;
    try {
      data = frameData(image, patternLook(spec.parameters), { ...DEFAULT_FRAME_LAYOUT, bitsPerCell });
    } catch (err) {
      throw new AppError(400, 'invalid_input', `The pattern cannot be packed as frame data for this panel: ${(err as Error).message}.`);
    }
    const info = FRAME_DATA_FORMAT_INFO[format];
    return {
      bytes: Buffer.from(encodeFrameData(data, format, name.replace(/-/g, '_'))),
      fileName: `${name}.${info.extension}`,
      contentType: info.type,
    };
  }

  async create(actor: MatchActor, photo: Buffer, fileName: string, fields: MatchUpload): Promise<MatchDto> {
    const look = await resolveLook(actor.studioId, fields.look, 'look');
    const { width, height } = await photoSize(photo);
    const cell = look.parameters.cell;
    const row = await PanelMatch.create({
      studioId: actor.studioId,
      createdById: actor.userId,
      look,
      photoName: fileName.slice(0, 255) || 'photo',
      photoWidth: width,
      photoHeight: height,
      activeWidthMm: fields.activeWidthMm ?? +(cell.cols * cell.pitchXMm).toFixed(3),
      activeHeightMm: fields.activeHeightMm ?? +(cell.rows * cell.pitchYMm).toFixed(3),
      cameraGamma: fields.cameraGamma ?? null,
    });
    try {
      await this.blobs.put(photoKey(row.id), photo);
    } catch (err) {
      await row.destroy();
      throw err;
    }
    await record(actor.studioId, actor.userId, 'match.created', `uploaded a match photo of “${look.name}”`);
    return this.dto(row, await displayNames([row.createdById]));
  }

  async list(studioId: string): Promise<MatchDto[]> {
    const rows = await PanelMatch.findAll({ where: { studioId }, order: [['createdAt', 'DESC']], limit: 50 });
    const who = await displayNames(rows.map((r) => r.createdById));
    return rows.map((r) => this.dto(r, who));
  }

  async get(studioId: string, id: string): Promise<MatchDto> {
    const row = await this.row(studioId, id);
    return this.dto(row, await displayNames([row.createdById]));
  }

  /** The photo upright (as its EXIF orientation says), as a JPEG for placing the marks on. */
  async photo(studioId: string, id: string): Promise<Buffer> {
    const row = await this.row(studioId, id);
    return sharp(await this.blobs.get(photoKey(row.id)), { limitInputPixels: MAX_PHOTO_PIXELS })
      .rotate()
      .jpeg({ quality: 88 })
      .toBuffer();
  }

  /** Output pixels a pitch of the previews: the panel at most 1280 px wide. */
  private previewScale(row: PanelMatch): number {
    return Math.max(1, Math.floor(1280 / row.look.parameters.cell.cols));
  }

  /** The photo resampled onto the panel's grid through the marks as placed (PNG), to lay over the simulated pattern. */
  async rectified(studioId: string, id: string): Promise<Buffer> {
    const row = await this.row(studioId, id);
    if (!row.marks) throw new AppError(409, 'no_marks', 'Place the four marks on the corner squares first.');
    return encodePng(
      await this.engine.rectifyPhoto(await this.decodedPhoto(row.id), row.marks, row.look.parameters, this.previewScale(row)),
    );
  }

  /** The pattern as the look shows it (a reference render, source stage neutral so every cell gets its pattern level), at the rectified photo's size. */
  async simulated(studioId: string, id: string): Promise<Buffer> {
    const row = await this.row(studioId, id);
    const parameters = patternLook(row.look.parameters);
    const input = await encodePng(patternImage(patternFor(row.look.parameters)));
    return (await this.engine.render({ input, parameters, scale: this.previewScale(row), frame: 0 })).png;
  }

  /** The fit's images side by side: the photo, the model and their difference (in the isolated-cell box). */
  async residual(studioId: string, id: string): Promise<Buffer> {
    const row = await this.row(studioId, id);
    if (row.status !== 'done') throw new AppError(409, 'not_ready', 'The fit has not finished yet.');
    return this.blobs.get(residualKey(row.id));
  }

  async setMarks(actor: MatchActor, id: string, marks: Point[]): Promise<MatchDto> {
    const row = await this.own(actor, id);
    if (row.status === 'queued' || row.status === 'running')
      throw new AppError(409, 'busy', 'The fit is running; wait for it before moving the marks.');
    try {
      checkMarks(marks, row.photoWidth, row.photoHeight);
    } catch (err) {
      if (err instanceof MarkError) throw new AppError(422, 'bad_marks', err.message);
      throw err;
    }
    await row.update({ marks, status: 'marking', progress: 0, step: '', error: null, result: null });
    return this.dto(row, await displayNames([row.createdById]));
  }

  /** Queues the fit (the marks must be placed). */
  async fit(actor: MatchActor, id: string): Promise<MatchDto> {
    const row = await this.own(actor, id);
    if (!row.marks) throw new AppError(409, 'no_marks', 'Place the four marks on the corner squares first.');
    const [count] = await PanelMatch.update(
      { status: 'queued', progress: 0, step: 'Waiting for a worker', error: null, result: null },
      { where: { id: row.id, status: { [Op.in]: ['marking', 'done', 'failed'] } } },
    );
    if (count === 0) throw new AppError(409, 'busy', 'The fit is already waiting or running.');
    await this.jobs.send(QUEUES.matches, { matchId: row.id } satisfies MatchJob);
    await row.reload();
    return this.dto(row, await displayNames([row.createdById]));
  }

  /** Saves the fitted parameters as a new studio preset, or as a new revision of the studio preset the fit started from. */
  async save(
    actor: MatchActor,
    id: string,
    as: ({ name: string } | { revisionOfLook: true }) & { levelCurve?: boolean },
  ): Promise<{ presetId: string; match: MatchDto }> {
    const row = await this.own(actor, id);
    if (row.status !== 'done' || !row.result) throw new AppError(409, 'not_ready', 'Only a finished fit can be saved.');
    let parameters = row.result.parameters;
    if (as.levelCurve) {
      try {
        parameters = {
          ...parameters,
          drive: { ...parameters.drive, levelSpacing: 'table', dutyTable: dutyTableFromLevels(row.result.levels) },
        };
      } catch (err) {
        throw new AppError(422, 'no_level_curve', (err as Error).message);
      }
    }
    const message = `Fitted to the photo “${row.photoName}” from “${row.look.name}”${as.levelCurve ? ', with its measured level curve' : ''}`;
    let presetId: string;
    if ('name' in as) {
      presetId = (await this.presets.create(actor, { name: as.name, panelTypeId: row.look.panelTypeId, parameters }, { message })).id;
    } else {
      if (!row.look.id.startsWith('studio:'))
        throw new AppError(
          409,
          'not_a_studio_preset',
          'The fit started from a built-in look, which cannot take revisions: save it as a new preset.',
        );
      presetId = row.look.id.slice('studio:'.length);
      const current = await Preset.findOne({ where: { id: presetId, studioId: actor.studioId } });
      if (!current) throw notFound('The preset the fit started from');
      await this.presets.update(actor, presetId, { baseRevision: current.revision, parameters, message });
    }
    await row.update({ savedPresetId: presetId });
    return { presetId, match: this.dto(row, await displayNames([row.createdById])) };
  }

  async remove(actor: MatchActor, id: string): Promise<void> {
    const row = await this.own(actor, id);
    await row.destroy();
    await this.blobs.removePrefix(`matches/${row.id}/`);
  }

  /** Removes a studio's matches' files (the rows go with the studio). */
  async removeFor(studioId: string): Promise<void> {
    const rows = await PanelMatch.findAll({ where: { studioId }, attributes: ['id'] });
    for (const r of rows) await this.blobs.removePrefix(`matches/${r.id}/`);
  }

  /** The job: decodes the photo, fits on the pool with progress in the row, writes the result and its images. */
  async run(job: MatchJob): Promise<void> {
    const row = await PanelMatch.findByPk(job.matchId);
    if (!row || !row.marks || row.status === 'done') return;
    await row.update({ status: 'running', progress: 0.01, step: 'Reading the photo' });
    try {
      const photo = await this.decodedPhoto(row.id);
      let last = 0;
      const outcome = await this.engine.fitMatch(
        {
          photo,
          marks: row.marks,
          base: row.look.parameters,
          options: {
            camera: row.cameraGamma ? { kind: 'gamma', gamma: row.cameraGamma } : { kind: 'srgb' },
            activeWidthMm: row.activeWidthMm,
            activeHeightMm: row.activeHeightMm,
          },
        },
        (share, step) => {
          if (share - last < 0.04) return;
          last = share;
          void PanelMatch.update({ progress: share, step }, { where: { id: row.id, status: 'running' } });
        },
      );
      if ('refusal' in outcome) {
        await row.update({ status: 'failed', step: 'Could not fit', error: outcome.refusal });
        return;
      }
      const { residual, ...result } = outcome.result;
      await this.blobs.put(residualKey(row.id), await residualPng(residual.photo, residual.model));
      await row.update({ status: 'done', progress: 1, step: 'Fitted', result, marks: result.marks });
      await record(row.studioId, row.createdById, 'match.fitted', `fitted “${row.look.name}” to the photo “${row.photoName}”`);
    } catch (err) {
      const message =
        err instanceof MatchRefusal || err instanceof AppError ? err.message : 'The fit failed on our side and was logged. Try again.';
      if (!(err instanceof AppError)) console.error(`[matches] ${row.id}: ${(err as Error).message}`);
      await row.update({ status: 'failed', step: 'Could not fit', error: message });
    }
  }

  /** A match's photo, upright (by its EXIF orientation), as RGBA: what the fit and the previews read. */
  private async decodedPhoto(id: string): Promise<RgbaImage> {
    const decoded = await sharp(await this.blobs.get(photoKey(id)), { limitInputPixels: MAX_PHOTO_PIXELS })
      .rotate()
      .ensureAlpha()
      .raw()
      .toBuffer({ resolveWithObject: true });
    return {
      width: decoded.info.width,
      height: decoded.info.height,
      data: new Uint8Array(decoded.data.buffer, decoded.data.byteOffset, decoded.data.length),
    };
  }

  private async row(studioId: string, id: string): Promise<PanelMatch> {
    const row = await PanelMatch.findOne({ where: { id, studioId } });
    if (!row) throw notFound('The match');
    return row;
  }

  /** A match the actor may change: their own, or anyone's as an owner. */
  private async own(actor: MatchActor, id: string): Promise<PanelMatch> {
    const row = await this.row(actor.studioId, id);
    if (row.createdById !== actor.userId && actor.role !== 'owner')
      throw forbidden('Only its maker or a studio owner can change this match.');
    return row;
  }

  private dto(row: PanelMatch, who: Map<string, string> = new Map()): MatchDto {
    return {
      id: row.id,
      look: { id: row.look.id, name: row.look.name, panelTypeId: row.look.panelTypeId, panelTypeName: row.look.panelTypeName },
      photo: { width: row.photoWidth, height: row.photoHeight, fileName: row.photoName },
      activeWidthMm: row.activeWidthMm,
      activeHeightMm: row.activeHeightMm,
      cameraGamma: row.cameraGamma,
      marks: row.marks ?? null,
      status: row.status,
      statusLabel: MATCH_STATUS_LABELS[row.status as MatchStatus],
      progress: row.progress,
      step: row.step,
      error: row.error ?? null,
      result: row.result ?? null,
      savedPresetId: row.savedPresetId ?? null,
      createdBy: row.createdById ? { id: row.createdById, name: who.get(row.createdById) ?? 'Someone' } : null,
      createdAt: row.createdAt.toISOString(),
    };
  }
}

/** A look with its source stage neutral and no dither, so the pattern image drives every cell at exactly its pattern level. */
function patternLook(p: PanelParams): PanelParams {
  return {
    ...p,
    source: { ...p.source, fit: 'native', luma: 'rec709', brightness: 0, contrast: 1, gamma: 1, invert: false, threshold: 0 },
    drive: { ...p.drive, dither: 'none' },
  };
}

/** The photo's upright size, or 400/413 saying what is wrong with it. */
async function photoSize(bytes: Buffer): Promise<{ width: number; height: number }> {
  let meta: Metadata;
  try {
    meta = await sharp(bytes, { limitInputPixels: false }).metadata();
  } catch {
    // An ISO media file whose brand is HEVC-coded HEIF: the image library here reads AVIF, not HEVC.
    const brand = bytes.subarray(4, 12).toString('latin1');
    if (/^ftyp(heic|heix|hevc|hevx|mif1|msf1)/.test(brand)) {
      throw new AppError(
        415,
        'heic_not_supported',
        'HEIC photos (the default on many phones) cannot be read here. Set the camera to JPEG (“Most Compatible”), or export the photo as JPEG, and upload that.',
      );
    }
    throw new AppError(400, 'unreadable_image', 'The photo could not be read as an image. Send the camera’s JPEG, or a PNG, WebP or AVIF.');
  }
  const turned = (meta.orientation ?? 1) >= 5;
  const width = (turned ? meta.height : meta.width) ?? 0;
  const height = (turned ? meta.width : meta.height) ?? 0;
  if (width * height > MAX_PHOTO_PIXELS)
    throw new AppError(
      413,
      'photo_too_large',
      `The photo is ${width} × ${height} pixels; the limit is ${MAX_PHOTO_PIXELS / 1e6} megapixels. Send a smaller version.`,
    );
  if (Math.max(width, height) < MIN_PHOTO.width || Math.min(width, height) < MIN_PHOTO.height) {
    throw new AppError(
      422,
      'photo_too_small',
      `The photo is ${width} × ${height} pixels; at least ${MIN_PHOTO.width} × ${MIN_PHOTO.height} are needed to see the cells. Send the camera's full-size photo.`,
    );
  }
  return { width, height };
}

/** Photo, model and difference side by side as a PNG: light shown with the sRGB curve, the difference red (photo brighter) and blue (model brighter) on gray. */
async function residualPng(photo: Rectified, model: Rectified): Promise<Buffer> {
  const { width, height } = photo;
  const gap = 8;
  // Dark gaps between the three, as the app's dark surfaces.
  const out = { width: 3 * width + 2 * gap, height, data: new Uint8Array((3 * width + 2 * gap) * height * 4).fill(28) };
  let peak = 0;
  for (let i = 0; i < model.data.length; i++) peak = Math.max(peak, model.data[i]);
  let spread = 0;
  for (let i = 0; i < photo.data.length; i++) spread = Math.max(spread, Math.abs(photo.data[i] - model.data[i]));
  const enc = (v: number) => Math.round(255 * Math.min(1, Math.max(0, v)) ** (1 / 2.2));
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const i = y * width + x;
      const put = (ox: number, rgb: [number, number, number]) => out.data.set([...rgb, 255], (y * out.width + ox + x) * 4);
      const p = enc(photo.data[i] / peak);
      const m = enc(model.data[i] / peak);
      put(0, [p, p, p]);
      put(width + gap, [m, m, m]);
      const d = spread > 0 ? (photo.data[i] - model.data[i]) / spread : 0;
      put(
        2 * (width + gap),
        d >= 0
          ? [128 + Math.round(127 * d), 128 - Math.round(90 * d), 128 - Math.round(90 * d)]
          : [128 + Math.round(90 * d), 128 + Math.round(90 * d), 128 - Math.round(127 * d)],
      );
    }
  }
  return encodePng(out);
}
