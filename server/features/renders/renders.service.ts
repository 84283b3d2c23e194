import { Op, type Sequelize } from 'sequelize';
import sharp from 'sharp';
import type { RenderDto } from '@shared/api/render.schema';
import { builtInPresetById } from '@shared/model/panel-types';
import { mergeParams, panelParamsPatchSchema, panelParamsSchema, type PanelParams, type PanelParamsPatch } from '@shared/model/parameters';
import { AppError, notFound } from '../../core/app-error';
import { parseOrThrow } from '../../core/validate';
import type { RenderedPng, RenderEngine, RenderRequest } from '../../render/render-engine';
import { renderKey } from '../../render/render-key';
import type { RenderStore } from '../../storage/render-store';
import { Render } from './render.model';

function parseJsonField(text: string, what: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    throw new AppError(400, 'invalid_input', `${what} is not valid JSON.`);
  }
}

/** Resolves the parameters of a render request: a built-in preset (plus patch) or inline parameters. */
export function resolveParameters(fields: { presetId?: string; parameters?: unknown; patch?: unknown }): PanelParams {
  const json = (v: unknown, what: string) => (typeof v === 'string' ? parseJsonField(v, what) : v);
  if (fields.parameters !== undefined) return parseOrThrow(panelParamsSchema, json(fields.parameters, 'parameters'), 'parameters');
  const preset = builtInPresetById(fields.presetId!);
  if (!preset)
    throw new AppError(400, 'unknown_preset', `There is no built-in preset "${fields.presetId}". GET /api/panel-types lists them.`);
  const patch =
    fields.patch !== undefined ? (parseOrThrow(panelParamsPatchSchema, json(fields.patch, 'patch'), 'patch') as PanelParamsPatch) : {};
  return parseOrThrow(panelParamsSchema, mergeParams(preset.parameters, patch), 'parameters');
}

/** Who a render belongs to: a studio's artwork, or (an uploaded file) the user who asked. */
export type RenderOwner = { studioId: string; artworkId: string; userId: string } | { studioId?: undefined; userId: string };

/** Longest side of a preset thumbnail, in pixels. */
export const THUMBNAIL_PX = 160;

/** Default size budget of one studio's stored renders (least recently used go first). */
export const DEFAULT_STUDIO_RENDER_BUDGET = 2 * 1024 ** 3;

/**
 * Stored reference renders: rendered once per key on the pool (concurrent requests for one key
 * share one render), owned by a studio and artwork or by a user, read only through that owner's
 * route, deleted with what they came from and by a per-studio size budget.
 */
export class RendersService {
  private readonly inFlight = new Map<string, Promise<RenderDto>>();

  constructor(
    private readonly store: RenderStore,
    private readonly engine: RenderEngine,
    private readonly sequelize: Sequelize,
    private readonly studioBudgetBytes = DEFAULT_STUDIO_RENDER_BUDGET,
  ) {}

  /** A render from the cache, or rendered now (file first, then its row). */
  render(owner: RenderOwner, request: RenderRequest): Promise<RenderDto> {
    const key = renderKey(request, owner.studioId ? `studio:${owner.studioId}` : `user:${owner.userId}`);
    return this.singleFlight(key, () => this.renderOnce(key, owner, () => this.engine.render(request)));
  }

  /**
   * A small render for lists: the panel at scale 1, area-averaged to fit THUMBNAIL_PX, stored once
   * per artwork and parameter set (so once per preset revision) under its own key.
   */
  async thumbnail(
    owner: { studioId: string; artworkId: string; userId: string },
    request: Omit<RenderRequest, 'scale' | 'frame'>,
  ): Promise<Buffer> {
    const full = { ...request, scale: 1, frame: 0 };
    const key = renderKey(full, `studio:${owner.studioId}/thumbnail-${THUMBNAIL_PX}`);
    await this.singleFlight(key, () =>
      this.renderOnce(key, owner, async () => {
        const small = await sharp((await this.engine.render(full)).png)
          .resize(THUMBNAIL_PX, THUMBNAIL_PX, { fit: 'inside', kernel: 'linear', withoutEnlargement: true })
          .png({ compressionLevel: 6 })
          .toBuffer({ resolveWithObject: true });
        return { png: small.data, width: small.info.width, height: small.info.height };
      }),
    );
    return this.store.read(key);
  }

  /** Concurrent requests for one key share one piece of work; the later ones see it as cached. */
  private singleFlight(key: string, work: () => Promise<RenderDto>): Promise<RenderDto> {
    const running = this.inFlight.get(key);
    if (running) return running.then((dto) => ({ ...dto, cached: true }));
    const started = work().finally(() => this.inFlight.delete(key));
    this.inFlight.set(key, started);
    return started;
  }

  /** The PNG of a render, if it belongs to this owner (404 otherwise, the same as a missing one). */
  async read(key: string, owner: { studioId: string } | { userId: string }): Promise<Buffer> {
    const where = 'studioId' in owner ? { key, studioId: owner.studioId } : { key, studioId: { [Op.is]: null }, createdById: owner.userId };
    const row = /^[0-9a-f]{64}$/.test(key) ? await Render.findOne({ where }) : null;
    if (!row) throw notFound('The render');
    const png = await this.store.read(key).catch(() => {
      throw notFound('The render file');
    });
    await row.update({ lastUsedAt: new Date() });
    return png;
  }

  /** Removes the renders of an artwork or a studio: rows first, then their files. */
  async removeFor(where: { artworkId: string } | { studioId: string }): Promise<number> {
    const rows = await Render.findAll({ attributes: ['key'], where });
    await Render.destroy({ where: { key: rows.map((r) => r.key) } });
    await this.store.remove(rows.map((r) => r.key));
    return rows.length;
  }

  /** Removes render files left without a row (a crash between file and row) and stray temp files. */
  reconcile(): Promise<number> {
    return this.store.reconcile(
      async (keys) => new Set(keys.length ? (await Render.findAll({ attributes: ['key'], where: { key: keys } })).map((r) => r.key) : []),
    );
  }

  private async renderOnce(key: string, owner: RenderOwner, produce: () => Promise<RenderedPng>): Promise<RenderDto> {
    const url = owner.studioId ? `/api/studios/${owner.studioId}/renders/${key}` : `/api/renders/${key}`;
    const row = await Render.findByPk(key);
    // A row whose file went missing is rendered again rather than served broken.
    if (row && (await this.store.exists(key))) {
      await row.update({ lastUsedAt: new Date() });
      return { key, url, width: row.width, height: row.height, cached: true };
    }
    const { png, width, height } = await produce();
    // A crash between the two writes leaves an unreferenced file (removed at start), never a row without one.
    await this.store.write(key, png);
    await Render.upsert({
      key,
      width,
      height,
      bytes: png.length,
      createdById: owner.userId,
      studioId: owner.studioId ?? null,
      artworkId: owner.studioId ? owner.artworkId : null,
      lastUsedAt: new Date(),
    });
    if (owner.studioId) await this.enforceBudget(owner.studioId, key);
    return { key, url, width, height, cached: false };
  }

  /** Drops a studio's least recently used renders until its total is within the budget; never `keep`, the one just made. */
  private async enforceBudget(studioId: string, keep: string): Promise<void> {
    const [over] = (await this.sequelize.query(
      `SELECT key FROM (
         SELECT key, sum(bytes) OVER (ORDER BY last_used_at DESC, key) AS running FROM renders WHERE studio_id = $1
       ) r WHERE running > $2`,
      { bind: [studioId, this.studioBudgetBytes] },
    )) as [{ key: string }[], unknown];
    if (!over.length) return;
    const keys = over.map((r) => r.key).filter((k) => k !== keep);
    if (!keys.length) return;
    await Render.destroy({ where: { key: keys } });
    await this.store.remove(keys);
  }
}
