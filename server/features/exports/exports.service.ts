import { Op } from 'sequelize';
import {
  EXPORT_STATUS_LABELS,
  MAX_ANIMATION_FRAMES,
  type AnimationRequest,
  type ExportDto,
  type ExportFlash,
  type ExportFormat,
  type ExportLinkDto,
  type SharedExportDto,
  type SheetRequest,
} from '@shared/api/export.schema';
import type { SpriteSheet } from '@shared/pipeline/sprite-sheet';
import { LABEL_LINES, MAX_SHEET_PIXELS, REPORT_LINES, sheetGeometry, type SheetLayout } from '@shared/export/sheet';
import type { Role } from '@shared/model/roles';
import type { RgbaImage } from '@shared/pipeline/types';
import { AppError, forbidden, notFound } from '../../core/app-error';
import type { SignedDownload } from '../../core/signed-links';
import { QUEUES, WORKER_NAME, type JobQueue } from '../../jobs/job-queue';
import { RenderEngine, type RenderRequest } from '../../render/render-engine';
import type { Config } from '../../config';
import type { BlobStore } from '../../storage/blob-store';
import { FileStore } from '../../storage/file-store';
import { record } from '../activity/activity.model';
import type { ArtworksService } from '../artworks/artworks.service';
import { displayNames } from '../auth/display-names';
import { studioName } from '../studios/studios.service';
import { Export, ExportLink, type AnimationSpec, type LookSpec, type SheetSpec } from './export.model';
import { resolveLook } from '../presets/looks';
import { hashToken, newToken } from '../../core/tokens';
import { makeSheet } from './sheet-cells';
import { makeAnimation } from './animation';
import { EXPORT_FILES, FORMATS_OF } from './export-files';

const FOLDER = 'exports';
/** Newest exports a studio's list shows. */
const LIST_LIMIT = 100;
/** How long a download link works. */
export const DOWNLOAD_LINK_SECONDS = 15 * 60;
/** What a sheet is called when its title is left empty (after the studio's name). */
const DEFAULT_TITLES: Readonly<Record<SheetLayout, (looks: number) => string>> = {
  grid: (n) => `${n === 1 ? 'one look' : `${n} looks`} side by side`,
  'side-by-side': (n) => `originals beside ${n === 1 ? 'one look' : `${n} looks`}`,
  'ab-diff': () => 'A/B of two looks',
};
/** Most pixels of all an animation's frames together (about 400 MB of RGBA while they are encoded). */
const MAX_ANIMATION_PIXELS = 100_000_000;

export interface ExportActor {
  studioId: string;
  userId: string;
  role: Role;
}

const linkDto = (l: ExportLink): ExportLinkDto => ({
  id: l.id,
  expiresAt: l.expiresAt?.toISOString() ?? null,
  revokedAt: l.revokedAt?.toISOString() ?? null,
  createdAt: l.createdAt.toISOString(),
});

/** What the export job carries: the row is the whole request. */
export interface ExportJob {
  exportId: string;
}

/** The service as the app and the workers make it: files in the storage folder, stale after the job's every attempt has expired. */
export function exportsService(
  config: Config,
  blobs: BlobStore,
  artworks: ArtworksService,
  engine: RenderEngine,
  jobs: JobQueue,
): ExportsService {
  return new ExportsService(
    new FileStore(blobs),
    artworks,
    engine,
    jobs,
    (config.jobs.retries + 1) * config.jobs.expireSeconds * 1000 + 60_000,
  );
}

/**
 * Comparison sheets as background jobs. A request is checked in full (artworks and looks of the
 * studio, frame, sheet size) and frozen into a row before a job is queued; the job renders each
 * cell on the render pool, reporting progress in the row, and writes the file once, under the
 * row's id, so running a job twice (a worker killed mid-job, then the retry) leaves one result.
 * A job stops between cells when its row is cancelled or deleted, and removes what it wrote.
 */
export class ExportsService {
  constructor(
    private readonly files: FileStore,
    private readonly artworks: ArtworksService,
    private readonly engine: RenderEngine,
    private readonly jobs: JobQueue,
    /** An export still running this long after its last word is taken as lost (its worker died and the retries ran out). */
    private readonly staleAfterMs: number,
  ) {}

  async create(actor: ExportActor, body: SheetRequest): Promise<ExportDto> {
    const studio = await studioName(actor.studioId);
    if (studio === null) throw notFound('The studio');
    const found = await this.artworks.pickAll(actor.studioId, body.artworkIds);
    const missing = body.artworkIds.filter((id) => !found.some((a) => a.id === id));
    if (missing.length)
      throw new AppError(
        400,
        'invalid_input',
        `${missing.length === 1 ? 'One chosen artwork is' : `${missing.length} chosen artworks are`} not in this studio's library (deleted, or another studio's). Choose again from the list.`,
        { issues: missing.map((id) => ({ path: 'artworkIds', message: `no artwork ${id} in this studio` })) },
      );
    const artworks = body.artworkIds.map((id) => found.find((a) => a.id === id)!);
    const short = artworks.find((a) => body.frame >= a.frameCount);
    if (short)
      throw new AppError(
        400,
        'invalid_input',
        `Frame ${body.frame + 1} is past the end of “${short.name}”, which has ${short.frameCount === 1 ? 'one frame' : `${short.frameCount} frames`}. Choose frame 1 to ${Math.min(...artworks.map((a) => a.frameCount))}.`,
      );
    const looks = await Promise.all(body.looks.map((ref) => this.look(actor.studioId, ref)));

    // The whole sheet's size, from the renders' sizes, before anything is queued.
    const sizes = looks.map((l) => RenderEngine.check({ parameters: l.parameters, scale: body.scale }));
    if (body.layout === 'ab-diff' && (sizes[0].width !== sizes[1].width || sizes[0].height !== sizes[1].height)) {
      throw new AppError(
        400,
        'invalid_input',
        `An A/B sheet compares two renders of one size, and these differ: “${looks[0].name}” renders at ${sizes[0].width} × ${sizes[0].height} px, “${looks[1].name}” at ${sizes[1].width} × ${sizes[1].height} px. Choose two looks of one panel type.`,
      );
    }
    const row = (cells: { width: number; height: number }[]) =>
      body.layout === 'grid' ? cells : body.layout === 'side-by-side' ? [cells[0], ...cells] : [...cells, cells[0]];
    const geometry = sheetGeometry(
      artworks.map(() => row(sizes)),
      body.report ? LABEL_LINES + REPORT_LINES : LABEL_LINES,
    );
    if (geometry.width * geometry.height > MAX_SHEET_PIXELS) {
      throw new AppError(
        400,
        'output_too_large',
        `The sheet would be ${geometry.width} × ${geometry.height} pixels; the limit is ${MAX_SHEET_PIXELS / 1e6} million. Lower the scale or choose fewer artworks or looks.`,
      );
    }

    const spec: SheetSpec = {
      studioName: studio,
      layout: body.layout,
      scale: body.scale,
      frame: body.frame,
      artworks: artworks.map((a) => ({ id: a.id, name: a.name })),
      looks,
      report: body.report,
    };
    const title = body.title ?? `${studio}: ${DEFAULT_TITLES[body.layout](looks.length)}`;
    return this.queue(
      actor,
      { title, kind: 'sheet', layout: body.layout, spec },
      `asked for the comparison sheet “${title}” (${artworks.length * looks.length} cells)`,
    );
  }

  /** An animated export: every frame of one animation through one look, checked in full before it is queued. */
  async createAnimation(actor: ExportActor, body: AnimationRequest): Promise<ExportDto> {
    const studio = await studioName(actor.studioId);
    if (studio === null) throw notFound('The studio');
    const artwork = await this.artworks.pick(actor.studioId, body.artworkId);
    if (!artwork)
      throw new AppError(
        400,
        'invalid_input',
        "The chosen artwork is not in this studio's library (deleted, or another studio's). Choose again from the list.",
        { issues: [{ path: 'artworkId', message: 'no such artwork in this studio' }] },
      );
    if (artwork.frameCount < 2)
      throw new AppError(
        400,
        'invalid_input',
        `“${artwork.name}” is a still (one frame): an animated export needs an animation (GIF, APNG, animated WebP or a sprite sheet). For stills, make a comparison sheet.`,
      );
    if (artwork.frameCount > MAX_ANIMATION_FRAMES)
      throw new AppError(
        400,
        'invalid_input',
        `“${artwork.name}” has ${artwork.frameCount} frames; an animated export takes at most ${MAX_ANIMATION_FRAMES}. Shorten the animation.`,
      );
    const look = await this.look(actor.studioId, body.look);
    const { width, height } = RenderEngine.check({ parameters: look.parameters, scale: body.scale });
    if (width * height * artwork.frameCount > MAX_ANIMATION_PIXELS) {
      throw new AppError(
        400,
        'output_too_large',
        `${artwork.frameCount} frames of ${width} × ${height} pixels are over the limit of ${MAX_ANIMATION_PIXELS / 1e6} million pixels in all. Lower the scale.`,
      );
    }
    const durationMs = artwork.delaysMs.reduce((a, b) => a + b, 0);
    const spec: AnimationSpec = {
      studioName: studio,
      artwork: { id: artwork.id, name: artwork.name },
      look,
      scale: body.scale,
      distanceMm: body.distanceMm,
      frames: artwork.frameCount,
      durationMs,
    };
    const title = body.title ?? `${artwork.name} through ${look.name} (${look.panelTypeName})`.slice(0, 120);
    return this.queue(
      actor,
      { title, kind: 'animation', layout: 'animation', spec },
      `asked for the animation “${title}” (${artwork.frameCount} frames)`,
    );
  }

  /** Writes the request's row, then queues its job (a row whose job could not be queued is taken back). */
  private async queue(actor: ExportActor, what: Pick<Export, 'title' | 'kind' | 'layout' | 'spec'>, summary: string): Promise<ExportDto> {
    const created = await Export.create({
      studioId: actor.studioId,
      createdById: actor.userId,
      ...what,
      status: 'queued',
      step: 'Waiting for a worker',
    });
    try {
      await this.jobs.send(QUEUES.exports, { exportId: created.id } satisfies ExportJob);
    } catch (err) {
      await created.destroy();
      throw err;
    }
    await record(actor.studioId, actor.userId, 'export.created', summary);
    return this.dto(created, await displayNames([created.createdById]));
  }

  private look(studioId: string, ref: string): Promise<LookSpec> {
    return resolveLook(studioId, ref);
  }

  async list(studioId: string): Promise<ExportDto[]> {
    await this.failStale(studioId);
    const rows = await Export.findAll({ where: { studioId }, order: [['createdAt', 'DESC']], limit: LIST_LIMIT });
    const who = await displayNames(rows.map((r) => r.createdById));
    return rows.map((r) => this.dto(r, who));
  }

  async get(studioId: string, id: string): Promise<ExportDto> {
    await this.failStale(studioId);
    const row = await this.row(studioId, id);
    return this.dto(row, await displayNames([row.createdById]));
  }

  /**
   * Where a finished file downloads from, by format (409 while it is being made): an expiring link
   * the storage signs (a bucket's presigned URL) or, for files on disk, one the app signs and serves
   * at /api/downloads/<token>. Either works without a session until it expires.
   */
  async downloadUrl(studioId: string, id: string, format: ExportFormat, sign: (d: SignedDownload) => string): Promise<string> {
    const row = await this.row(studioId, id);
    if (row.status !== 'done')
      throw new AppError(
        409,
        'not_ready',
        `“${row.title}” is ${EXPORT_STATUS_LABELS[row.status].toLowerCase()}, not ready: it can be downloaded once it is.`,
      );
    if (!FORMATS_OF[row.kind].includes(format))
      throw new AppError(
        400,
        'invalid_input',
        `${row.kind === 'sheet' ? 'A comparison sheet' : 'An animation'} is made as ${FORMATS_OF[row.kind].join(', ')}, not ${format}.`,
      );
    const file = EXPORT_FILES[format];
    const as = { fileName: `${row.title.replace(/[^\w .-]/g, '_').slice(0, 100)}.${file.extension}`, contentType: file.type };
    const key = this.files.key(FOLDER, row.id, file.name);
    return (
      (await this.files.blobs.presignedUrl(key, DOWNLOAD_LINK_SECONDS, as)) ??
      sign({ key, ...as, expiresAt: Date.now() + DOWNLOAD_LINK_SECONDS * 1000 })
    );
  }

  /** The export's share links, newest first. */
  async links(studioId: string, id: string): Promise<ExportLinkDto[]> {
    const row = await this.row(studioId, id);
    return (await ExportLink.findAll({ where: { exportId: row.id }, order: [['createdAt', 'DESC']] })).map(linkDto);
  }

  /** A read-only link to a finished export (the token is shown once and stored hashed). */
  async createLink(actor: ExportActor, id: string, body: { expiresInDays?: number }, appUrl: string): Promise<ExportLinkDto> {
    const row = await this.row(actor.studioId, id);
    if (row.status !== 'done')
      throw new AppError(
        409,
        'not_ready',
        `“${row.title}” is ${EXPORT_STATUS_LABELS[row.status].toLowerCase()}: a share link can be made once it is ready.`,
      );
    const { token, hash } = newToken();
    const link = await ExportLink.create({
      exportId: row.id,
      tokenHash: hash,
      createdById: actor.userId,
      expiresAt: body.expiresInDays ? new Date(Date.now() + body.expiresInDays * 86_400_000) : null,
    });
    await record(actor.studioId, actor.userId, 'link.created', `created a share link to the export “${row.title}”`);
    return { ...linkDto(link), url: `${appUrl}/shared-exports/${token}` };
  }

  async revokeLink(actor: ExportActor, id: string, linkId: string): Promise<void> {
    const row = await this.row(actor.studioId, id);
    const link = await ExportLink.findOne({ where: { id: linkId, exportId: row.id } });
    if (!link) throw notFound('The link');
    await link.update({ revokedAt: new Date() });
    await record(actor.studioId, actor.userId, 'link.revoked', `revoked a share link to the export “${row.title}”`);
  }

  /** The export a share token opens; 404 alike for unknown, revoked and expired tokens and for exports gone or not ready. */
  private async sharedRow(token: string): Promise<Export> {
    const link = /^[A-Za-z0-9_-]{20,100}$/.test(token) ? await ExportLink.findOne({ where: { tokenHash: hashToken(token) } }) : null;
    const row =
      link && !link.revokedAt && !(link.expiresAt && link.expiresAt.getTime() < Date.now()) ? await Export.findByPk(link.exportId) : null;
    if (!row || row.status !== 'done') throw notFound('The shared export');
    return row;
  }

  async shared(token: string): Promise<SharedExportDto> {
    const row = await this.sharedRow(token);
    const dto = this.dto(row, new Map());
    const base = `/api/shared-exports/${token}`;
    return {
      title: row.title,
      kind: row.kind,
      layout: dto.layout,
      studioName: row.spec.studioName,
      createdAt: dto.createdAt,
      artworks: dto.artworks.map((a) => a.name),
      looks: dto.looks.map(({ name, revision, panelTypeName }) => ({ name, revision, panelTypeName })),
      width: row.width,
      height: row.height,
      figures: row.figures,
      animation: dto.animation,
      previewUrl: row.kind === 'sheet' ? `${base}/preview` : null,
      files: dto.files.map((f) => ({ ...f, url: `${base}/file?format=${f.format}` })),
    };
  }

  /** A shared sheet's PNG, to show on the link's page. */
  async sharedPreview(token: string): Promise<Buffer> {
    const row = await this.sharedRow(token);
    if (row.kind !== 'sheet') throw notFound('The preview');
    return this.files.read(FOLDER, row.id, EXPORT_FILES.png.name);
  }

  /** Where a shared export's file downloads from (a signed, expiring link, as for members). */
  async sharedDownloadUrl(token: string, format: ExportFormat, sign: (d: SignedDownload) => string): Promise<string> {
    const row = await this.sharedRow(token);
    return this.downloadUrl(row.studioId, row.id, format, sign);
  }

  /** Stops a waiting or running export; what it wrote is removed. */
  async cancel(actor: ExportActor, id: string): Promise<ExportDto> {
    const row = await this.row(actor.studioId, id);
    this.mayChange(actor, row);
    const [count] = await Export.update(
      { status: 'cancelled', step: 'Cancelled', finishedAt: new Date() },
      { where: { id: row.id, status: { [Op.in]: ['queued', 'running'] } } },
    );
    if (!count)
      throw new AppError(
        409,
        'conflict',
        `“${row.title}” is ${EXPORT_STATUS_LABELS[row.status].toLowerCase()}: only a waiting or running export can be cancelled.`,
      );
    await this.files.remove(FOLDER, row.id);
    await record(actor.studioId, actor.userId, 'export.cancelled', `cancelled the export “${row.title}”`);
    return this.get(actor.studioId, id);
  }

  /** Queues a failed or cancelled export again, as it was asked for. */
  async retry(actor: ExportActor, id: string): Promise<ExportDto> {
    const row = await this.row(actor.studioId, id);
    this.mayChange(actor, row);
    const [count] = await Export.update(
      { status: 'queued', progress: 0, step: 'Waiting for a worker', error: null, finishedAt: null },
      { where: { id: row.id, status: { [Op.in]: ['failed', 'cancelled'] } } },
    );
    if (!count)
      throw new AppError(
        409,
        'conflict',
        `“${row.title}” is ${EXPORT_STATUS_LABELS[row.status].toLowerCase()}: only a failed or cancelled export can be tried again.`,
      );
    await this.jobs.send(QUEUES.exports, { exportId: row.id } satisfies ExportJob);
    return this.get(actor.studioId, id);
  }

  /** Deletes an export and its file (a running one stops); editors their own, owners anyone's. */
  async remove(actor: ExportActor, id: string): Promise<void> {
    const row = await this.row(actor.studioId, id);
    this.mayChange(actor, row);
    await row.destroy();
    await this.files.remove(FOLDER, row.id);
    await record(actor.studioId, actor.userId, 'export.deleted', `deleted the export “${row.title}”`);
  }

  /** Editors act on their own exports; owners on anyone's. */
  private mayChange(actor: ExportActor, row: Export): void {
    if (actor.role !== 'owner' && row.createdById !== actor.userId)
      throw forbidden('Only the person who asked for this export, or a studio owner, can change or delete it.');
  }

  /**
   * The job: renders every cell (or frame) on the pool, puts the files together, writes them,
   * marks the row done. Safe to run again for the same export: a finished one is left alone, a
   * half-done one (its worker was killed) starts over and writes the same files.
   */
  async run(job: ExportJob): Promise<void> {
    const row = await Export.findByPk(job.exportId);
    if (!row || row.status === 'done' || row.status === 'cancelled') return;
    await row.update({ status: 'running', attempts: row.attempts + 1, workedBy: WORKER_NAME, progress: 0, step: 'Starting', error: null });
    const stillWanted = async () => (await Export.count({ where: { id: row.id, status: 'running' } })) === 1;
    try {
      const by = (await displayNames([row.createdById])).get(row.createdById ?? '') ?? 'a former member';
      const source = async (a: { id: string; name: string }) => {
        const artwork = await this.artworks.pick(row.studioId, a.id);
        if (!artwork) throw new AppError(409, 'conflict', `“${a.name}” was deleted after the export was asked for. Ask again without it.`);
        return { input: await this.artworks.original(artwork.id), sheet: artwork.sheet };
      };
      const steps =
        row.kind === 'sheet'
          ? (row.spec as SheetSpec).artworks.length * (row.spec as SheetSpec).looks.length
          : (row.spec as AnimationSpec).frames;
      const common = {
        title: row.title,
        made: { at: row.createdAt, by },
        render: (req: RenderRequest) => this.renderPatiently(req),
        frames: (input: Buffer, sheet: SpriteSheet | null) => this.engine.decodedFrames(input, sheet),
        beforeStep: async (done: number, step: string) => {
          if (!(await stillWanted())) return false;
          await Export.update({ progress: done / (steps + 1), step }, { where: { id: row.id, status: 'running' } });
          return true;
        },
      };
      let made: {
        files: Partial<Record<ExportFormat, Buffer>>;
        width: number;
        height: number;
        figures?: ExportDto['figures'];
        flash?: ExportFlash;
      } | null;
      if (row.kind === 'sheet') {
        const spec = row.spec as SheetSpec;
        const sources = [];
        for (const a of spec.artworks) sources.push(await source(a));
        made = await makeSheet({ ...common, spec, sources });
      } else {
        const spec = row.spec as AnimationSpec;
        made = await makeAnimation({ ...common, spec, source: await source(spec.artwork) });
      }
      if (!made || !(await stillWanted())) return;
      const formats = FORMATS_OF[row.kind];
      for (const format of formats) await this.files.write(FOLDER, row.id, EXPORT_FILES[format].name, made.files[format]!);
      const sizes = Object.fromEntries(formats.map((f) => [f, made.files[f]!.length]));
      const [count] = await Export.update(
        {
          status: 'done',
          progress: 1,
          step: 'Ready',
          width: made.width,
          height: made.height,
          files: sizes,
          figures: made.figures ?? null,
          flash: made.flash ?? null,
          finishedAt: new Date(),
        },
        { where: { id: row.id, status: 'running' } },
      );
      // Cancelled or deleted while the file was being written: nothing may stay behind.
      if (!count) await this.files.remove(FOLDER, row.id);
    } catch (err) {
      const message =
        err instanceof AppError && err.status < 500
          ? err.message
          : 'The export could not be made because of an error on our side, which was logged. Try again; if it fails again, tell us which artworks and looks.';
      if (!(err instanceof AppError && err.status < 500)) console.error(`[exports] ${row.id} failed: ${(err as Error).stack ?? err}`);
      await Export.update(
        { status: 'failed', step: 'Failed', error: message, finishedAt: new Date() },
        { where: { id: row.id, status: 'running' } },
      );
      await this.files.remove(FOLDER, row.id);
    }
  }

  /**
   * A render on the pool as background work: its tasks wait while interactive renders are queued,
   * and when the pool is full it waits its turn instead of failing.
   */
  private async renderPatiently(req: RenderRequest): Promise<RgbaImage> {
    for (let attempt = 0; ; attempt++) {
      try {
        return await this.engine.renderImage(req, { background: true });
      } catch (err) {
        if (!(err instanceof AppError && err.code === 'render_busy') || attempt >= 120) throw err;
        await new Promise((resolve) => setTimeout(resolve, 500));
      }
    }
  }

  /** Exports that stopped reporting long ago (their worker died and the queue gave up) are marked failed. */
  private async failStale(studioId: string): Promise<void> {
    await Export.update(
      { status: 'failed', step: 'Failed', error: 'The worker making this export stopped answering. Try again.', finishedAt: new Date() },
      { where: { studioId, status: 'running', updatedAt: { [Op.lt]: new Date(Date.now() - this.staleAfterMs) } } },
    );
  }

  /** Removes a studio's exports, rows then files (a running job finds its row gone and stops). */
  async removeFor(studioId: string): Promise<number> {
    const rows = await Export.findAll({ attributes: ['id'], where: { studioId } });
    await Export.destroy({ where: { studioId } });
    for (const r of rows) await this.files.remove(FOLDER, r.id);
    return rows.length;
  }

  /** Removes export folders without a row (a crash between file and row, or a deleted studio's). */
  async reconcile(): Promise<number> {
    const ids = (await this.files.ids(FOLDER)).filter((i) => /^[0-9a-f-]{36}$/.test(i));
    if (!ids.length) return 0;
    const known = new Set((await Export.findAll({ attributes: ['id'], where: { id: ids } })).map((e) => e.id));
    const orphans = ids.filter((i) => !known.has(i));
    for (const id of orphans) await this.files.remove(FOLDER, id);
    return orphans.length;
  }

  private async row(studioId: string, id: string): Promise<Export> {
    const row = await Export.findOne({ where: { id, studioId } });
    if (!row) throw notFound('The export');
    return row;
  }

  private dto(r: Export, names: Map<string, string>): ExportDto {
    const sheet = r.kind === 'sheet' ? (r.spec as SheetSpec) : null;
    const animation = r.kind === 'animation' ? (r.spec as AnimationSpec) : null;
    const looks = sheet ? sheet.looks : [animation!.look];
    return {
      id: r.id,
      title: r.title,
      kind: r.kind,
      layout: sheet ? sheet.layout : null,
      status: r.status,
      progress: r.progress,
      step: r.step,
      error: r.error,
      artworks: sheet ? sheet.artworks : [animation!.artwork],
      looks: looks.map((l) => ({ id: l.id, name: l.name, revision: l.revision, panelTypeName: l.panelTypeName })),
      scale: r.spec.scale,
      frame: sheet ? sheet.frame : 0,
      report: sheet ? sheet.report : false,
      cells: sheet ? sheet.artworks.length * sheet.looks.length : animation!.frames,
      width: r.width,
      height: r.height,
      figures: r.figures,
      animation: animation ? { frames: animation.frames, durationMs: animation.durationMs, flash: r.flash } : null,
      createdBy: { id: r.createdById, name: r.createdById ? (names.get(r.createdById) ?? 'a former member') : 'a former member' },
      createdAt: r.createdAt.toISOString(),
      finishedAt: r.finishedAt ? r.finishedAt.toISOString() : null,
      files:
        r.status === 'done' && r.files
          ? FORMATS_OF[r.kind].map((format) => ({
              format,
              label: EXPORT_FILES[format].label,
              url: `/api/studios/${r.studioId}/exports/${r.id}/file?format=${format}`,
              bytes: r.files![format],
            }))
          : [],
    };
  }
}
