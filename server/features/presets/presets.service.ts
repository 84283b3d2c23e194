import { Op, type Order, type Transaction } from 'sequelize';
import type { PresetDto, PresetRevisionDto, SharedViewDto, ShareLinkDto } from '@shared/api/dto';
import type { PresetDocument } from '@shared/api/preset.schema';
import { PRESET_FORMAT } from '@shared/api/preset.schema';
import { changeLabel, paramDiff } from '@shared/model/param-diff';
import { panelTypeById } from '@shared/model/panel-types';
import type { PanelParams } from '@shared/model/parameters';
import { roleAtLeast, type Role } from '@shared/model/roles';
import { AppError, conflict, forbidden, notFound } from '../../core/app-error';
import { ReadCache } from '../../core/read-cache';
import { hashToken, newToken } from '../../core/tokens';
import { record } from '../activity/activity.model';
import type { Artwork } from '../artworks/artwork.model';
import type { ArtworksService } from '../artworks/artworks.service';
import { displayNames } from '../auth/display-names';
import { roleIn } from '../studios/membership-lookup';
import { studioName } from '../studios/studios.service';
import { Preset, PresetRevision, ShareLink } from './preset.model';

/** Who is acting, in which studio, with which role. */
export interface Actor {
  studioId: string;
  userId: string;
  role: Role;
}

/** Studio presets: revisions on every save, optimistic concurrency, reference lock, share links. */
/** Pages of a studio's preset list, served from memory for a few seconds; emptied by any write to presets, studios or users (server/db/models.ts). */
export const presetListCache = new ReadCache<{ presets: PresetDto[]; total: number }>('preset-lists', 5_000, { maxEntries: 2_000 });

export class PresetsService {
  constructor(
    /** The studio's library: a share link shows a look on one of its artworks. */
    private readonly artworks: Pick<ArtworksService, 'pick'>,
  ) {}

  list(
    studioId: string,
    q: { panelTypeId?: string; search?: string; sort: string; page: number; pageSize: number },
  ): Promise<{ presets: PresetDto[]; total: number }> {
    return presetListCache.read(JSON.stringify([studioId, q.panelTypeId ?? '', q.search ?? '', q.sort, q.page, q.pageSize]), () =>
      this.query(studioId, q),
    );
  }

  private async query(
    studioId: string,
    q: { panelTypeId?: string; search?: string; sort: string; page: number; pageSize: number },
  ): Promise<{ presets: PresetDto[]; total: number }> {
    const where: Record<string, unknown> = { studioId };
    if (q.panelTypeId) where.panelTypeId = q.panelTypeId;
    if (q.search) where.name = { [Op.iLike]: `%${q.search.replace(/[\\%_]/g, (c) => `\\${c}`)}%` };
    const dir = q.sort.startsWith('-') ? 'DESC' : 'ASC';
    const order: Order = q.sort.endsWith('name') ? [['name', dir]] : [['updatedAt', dir]];
    const { rows, count } = await Preset.findAndCountAll({ where, order, limit: q.pageSize, offset: q.page * q.pageSize });
    const who = await displayNames(rows.map((r) => r.updatedById));
    return { presets: rows.map((r) => this.dto(r, who)), total: count };
  }

  async get(studioId: string, id: string): Promise<PresetDto> {
    const row = await this.row(studioId, id);
    return this.dto(row, await displayNames([row.updatedById]));
  }

  /**
   * Creates a preset at revision 1. A name already used in the studio is refused, or — for imports
   * and copies (`numberName`) — numbered: "Look (2)".
   */
  async create(
    actor: Actor,
    body: { name: string; panelTypeId: string; parameters?: PanelParams },
    options: { message?: string; numberName?: boolean; how?: 'created' | 'imported' | 'copied' } = {},
  ): Promise<PresetDto> {
    const message = options.message ?? 'Created';
    const how = options.how ?? 'created';
    const type = panelTypeById(body.panelTypeId);
    if (!type)
      throw new AppError(400, 'invalid_input', `panelTypeId "${body.panelTypeId}" is not a built-in panel type.`, {
        issues: [{ path: 'panelTypeId', message: 'unknown panel type' }],
      });
    const parameters = body.parameters ?? structuredClone(type.defaults);
    return Preset.sequelize!.transaction(async (transaction) => {
      // A typed name must be free; an imported or duplicated one gets the next free " (n)".
      const name = options.numberName
        ? await this.freeName(actor.studioId, body.name, transaction)
        : await this.assertFreeName(actor.studioId, body.name, null, transaction);
      const row = await Preset.create(
        { studioId: actor.studioId, panelTypeId: type.id, name, parameters, revision: 1, updatedById: actor.userId },
        { transaction },
      );
      await PresetRevision.create(
        { presetId: row.id, revision: 1, name: row.name, parameters, changes: [], message, authorId: actor.userId },
        { transaction },
      );
      await record(actor.studioId, actor.userId, `preset.${how}`, `${how} preset “${row.name}”`, transaction);
      return this.dto(row, await displayNames([actor.userId], transaction));
    });
  }

  /** Saves a new revision; the caller must have edited the current one (else 409 with it). */
  async update(
    actor: Actor,
    id: string,
    body: { baseRevision: number; name?: string; parameters?: PanelParams; message?: string },
  ): Promise<PresetDto> {
    // A stale base is answered without taking a lock or a transaction (most losers of a race stop here).
    const current = await this.row(actor.studioId, id);
    if (body.baseRevision !== current.revision) throw await this.stale(current, body.baseRevision);
    return Preset.sequelize!.transaction(async (transaction) => {
      const row = await this.row(actor.studioId, id, transaction);
      this.assertMayChange(row, actor);
      if (body.baseRevision !== row.revision) throw await this.stale(row, body.baseRevision, transaction);
      if (body.name !== undefined && body.name !== row.name) await this.assertFreeName(actor.studioId, body.name, row.id, transaction);
      return this.saveRevision(
        row,
        actor,
        body.name ?? row.name,
        body.parameters ?? row.parameters,
        body.message ?? null,
        'preset.changed',
        transaction,
      );
    });
  }

  async restore(actor: Actor, id: string, revision: number, message?: string): Promise<PresetDto> {
    return Preset.sequelize!.transaction(async (transaction) => {
      const row = await this.row(actor.studioId, id, transaction);
      this.assertMayChange(row, actor);
      const old = await PresetRevision.findOne({ where: { presetId: id, revision }, transaction });
      if (!old) throw notFound(`Revision ${revision}`);
      return this.saveRevision(
        row,
        actor,
        old.name,
        old.parameters,
        message ?? `Restored revision ${revision}`,
        'preset.restored',
        transaction,
      );
    });
  }

  async remove(actor: Actor, id: string): Promise<void> {
    await Preset.sequelize!.transaction(async (transaction) => {
      const row = await this.row(actor.studioId, id, transaction);
      this.assertMayChange(row, actor);
      await row.destroy({ transaction });
      await record(actor.studioId, actor.userId, 'preset.deleted', `deleted preset “${row.name}”`, transaction);
    });
  }

  async setReference(actor: Actor, id: string, isReference: boolean): Promise<PresetDto> {
    if (actor.role !== 'owner') throw forbidden('Only owners mark or unmark the studio’s reference look.');
    const row = await this.row(actor.studioId, id);
    await row.update({ isReference });
    await record(
      actor.studioId,
      actor.userId,
      'preset.reference',
      `${isReference ? 'locked' : 'unlocked'} preset “${row.name}” as the reference look`,
    );
    return this.dto(row, await displayNames([row.updatedById]));
  }

  /** Copies a preset into another studio where the caller is an editor or owner. */
  async duplicate(actor: Actor, id: string, targetStudioId: string, name?: string): Promise<PresetDto> {
    const row = await this.row(actor.studioId, id);
    const role = await roleIn(targetStudioId, actor.userId);
    if (!role) throw notFound('The target studio');
    if (!roleAtLeast(role, 'editor')) throw forbidden('You need to be an editor in the target studio.');
    return this.create(
      { studioId: targetStudioId, userId: actor.userId, role },
      { name: name ?? `${row.name} (copy)`, panelTypeId: row.panelTypeId, parameters: row.parameters },
      { message: 'Duplicated', numberName: true, how: 'copied' },
    );
  }

  async revisions(studioId: string, id: string): Promise<PresetRevisionDto[]> {
    await this.row(studioId, id);
    const rows = await PresetRevision.findAll({ where: { presetId: id }, order: [['revision', 'DESC']] });
    const who = await displayNames(rows.map((r) => r.authorId));
    return rows.map((r) => ({
      revision: r.revision,
      name: r.name,
      parameters: r.parameters,
      changes: r.changes,
      message: r.message,
      author: r.authorId ? (who.get(r.authorId) ?? null) : null,
      createdAt: r.createdAt.toISOString(),
    }));
  }

  exportDocument(p: PresetDto): PresetDocument {
    return { format: PRESET_FORMAT, version: 1, name: p.name, panelTypeId: p.panelTypeId, parameters: p.parameters };
  }

  async links(studioId: string, id: string): Promise<ShareLinkDto[]> {
    await this.row(studioId, id);
    const rows = await ShareLink.findAll({ where: { presetId: id }, order: [['createdAt', 'DESC']] });
    return rows.map((l) => this.linkDto(l));
  }

  async createLink(actor: Actor, id: string, body: { artworkId?: string; expiresInDays?: number }, appUrl: string): Promise<ShareLinkDto> {
    const row = await this.row(actor.studioId, id);
    // A link always shows the look on a picture: the chosen artwork, else the studio's newest.
    const artwork = await this.artworks.pick(actor.studioId, body.artworkId);
    if (body.artworkId && !artwork) throw notFound('The artwork');
    if (!artwork)
      throw new AppError(
        409,
        'no_artwork',
        'A share link shows the look on an artwork, and this studio has none yet. Upload one on the Artworks page first.',
      );
    const { token, hash } = newToken();
    const link = await ShareLink.create({
      presetId: row.id,
      artworkId: artwork.id,
      tokenHash: hash,
      createdById: actor.userId,
      expiresAt: body.expiresInDays ? new Date(Date.now() + body.expiresInDays * 86_400_000) : null,
    });
    await record(actor.studioId, actor.userId, 'link.created', `created a share link to “${row.name}”`);
    return { ...this.linkDto(link), url: `${appUrl}/share/${token}` };
  }

  /** The live share links (neither revoked nor expired) that show an artwork of the studio, with their preset's name. */
  async liveLinksShowing(
    studioId: string,
    artworkId: string,
  ): Promise<{ id: string; presetId: string; presetName: string; expiresAt: string | null }[]> {
    const links = await ShareLink.findAll({
      where: { artworkId, revokedAt: null, [Op.or]: [{ expiresAt: null }, { expiresAt: { [Op.gt]: new Date() } }] },
      order: [['createdAt', 'DESC']],
    });
    const presets = new Map(
      (await Preset.findAll({ where: { id: links.map((l) => l.presetId), studioId }, attributes: ['id', 'name'] })).map((p) => [
        p.id,
        p.name,
      ]),
    );
    return links
      .filter((l) => presets.has(l.presetId))
      .map((l) => ({
        id: l.id,
        presetId: l.presetId,
        presetName: presets.get(l.presetId)!,
        expiresAt: l.expiresAt?.toISOString() ?? null,
      }));
  }

  async revokeLink(actor: Actor, id: string, linkId: string): Promise<void> {
    const row = await this.row(actor.studioId, id);
    const link = await ShareLink.findOne({ where: { id: linkId, presetId: row.id } });
    if (!link) throw notFound('The link');
    await link.update({ revokedAt: new Date() });
    await record(actor.studioId, actor.userId, 'link.revoked', `revoked a share link to “${row.name}”`);
  }

  /** What a share token opens, or 404 for unknown, revoked or expired tokens alike. */
  async shared(token: string): Promise<{ view: SharedViewDto; artwork: Artwork | null }> {
    const link = /^[A-Za-z0-9_-]{20,100}$/.test(token) ? await ShareLink.findOne({ where: { tokenHash: hashToken(token) } }) : null;
    if (!link || link.revokedAt || (link.expiresAt && link.expiresAt.getTime() < Date.now())) throw notFound('The shared look');
    const preset = await Preset.findByPk(link.presetId);
    if (!preset) throw notFound('The shared look');
    const studio = await studioName(preset.studioId);
    // The link's artwork, or — when it was deleted since — the studio's newest, so a client never gets a look without a picture.
    const artwork =
      (link.artworkId ? await this.artworks.pick(preset.studioId, link.artworkId) : null) ?? (await this.artworks.pick(preset.studioId));
    return {
      artwork,
      view: {
        preset: { name: preset.name, panelTypeId: preset.panelTypeId, parameters: preset.parameters, revision: preset.revision },
        studioName: studio ?? '',
        artwork: artwork
          ? { name: artwork.name, width: artwork.width, height: artwork.height, frameCount: artwork.frameCount, delaysMs: artwork.delaysMs }
          : null,
        framesUrl: artwork ? `/api/share/${token}/frames` : null,
      },
    };
  }

  private async saveRevision(
    row: Preset,
    actor: Actor,
    name: string,
    parameters: PanelParams,
    message: string | null,
    kind: string,
    transaction: Transaction,
  ): Promise<PresetDto> {
    const changes = paramDiff(row.parameters, parameters);
    if (name !== row.name) changes.unshift({ path: 'name', from: row.name, to: name });
    const revision = row.revision + 1;
    await PresetRevision.create(
      { presetId: row.id, revision, name, parameters, changes, message, authorId: actor.userId },
      { transaction },
    );
    await row.update({ name, parameters, revision, updatedById: actor.userId }, { transaction });
    const verb = kind === 'preset.restored' ? 'restored' : 'changed';
    await record(
      actor.studioId,
      actor.userId,
      kind,
      `${verb} preset “${name}” (revision ${revision}${
        changes.length
          ? `: ${changes
              .map((c) => changeLabel(c.path))
              .slice(0, 4)
              .join(', ')}${changes.length > 4 ? '…' : ''}`
          : ''
      })`,
      transaction,
    );
    return this.dto(row, await displayNames([actor.userId], transaction));
  }

  /** The names of the studio's presets, lower-cased (names are unique per studio, case aside). */
  private async takenNames(studioId: string, transaction: Transaction, exceptId: string | null): Promise<Set<string>> {
    const rows = await Preset.findAll({ where: { studioId }, attributes: ['id', 'name'], transaction });
    return new Set(rows.filter((r) => r.id !== exceptId).map((r) => r.name.toLowerCase()));
  }

  private async assertFreeName(studioId: string, name: string, exceptId: string | null, transaction: Transaction): Promise<string> {
    if ((await this.takenNames(studioId, transaction, exceptId)).has(name.toLowerCase())) {
      throw conflict('name_taken', `The studio already has a preset called “${name}”. Choose another name.`, {
        issues: [{ path: 'name', message: 'is already used by another preset' }],
      });
    }
    return name;
  }

  /** `name`, or `name (2)`, `name (3)` … whichever is free first (at most 80 characters). */
  private async freeName(studioId: string, name: string, transaction: Transaction): Promise<string> {
    const taken = await this.takenNames(studioId, transaction, null);
    if (!taken.has(name.toLowerCase())) return name;
    for (let n = 2; ; n++) {
      const suffix = ` (${n})`;
      const candidate = `${name.slice(0, 80 - suffix.length)}${suffix}`;
      if (!taken.has(candidate.toLowerCase())) return candidate;
    }
  }

  private async stale(row: Preset, base: number, transaction?: Transaction): Promise<Error> {
    const message = `Someone saved revision ${row.revision} since you opened revision ${base}. Merge your changes into it and save again.`;
    return conflict('stale_revision', message, { current: this.dto(row, await displayNames([row.updatedById], transaction)) });
  }

  private assertMayChange(row: Preset, actor: Actor): void {
    if (row.isReference && actor.role !== 'owner') throw forbidden('This preset is the studio’s reference look; only owners change it.');
  }

  private async row(studioId: string, id: string, transaction?: Transaction): Promise<Preset> {
    const row = await Preset.findOne({ where: { id, studioId }, transaction, lock: transaction ? transaction.LOCK.UPDATE : undefined });
    if (!row) throw notFound('The preset');
    return row;
  }

  private dto(r: Preset, who: Map<string, string>): PresetDto {
    return {
      id: r.id,
      studioId: r.studioId,
      panelTypeId: r.panelTypeId,
      name: r.name,
      parameters: r.parameters,
      revision: r.revision,
      isReference: r.isReference,
      updatedAt: r.updatedAt.toISOString(),
      updatedBy: r.updatedById ? (who.get(r.updatedById) ?? null) : null,
    };
  }

  private linkDto(l: ShareLink): ShareLinkDto {
    return {
      id: l.id,
      artworkId: l.artworkId,
      expiresAt: l.expiresAt?.toISOString() ?? null,
      revokedAt: l.revokedAt?.toISOString() ?? null,
      createdAt: l.createdAt.toISOString(),
    };
  }
}
