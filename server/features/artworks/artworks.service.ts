import { randomUUID } from 'node:crypto';
import sharp from 'sharp';
import { Op, type Order, type Transaction } from 'sequelize';
import type { ArtworkDto } from '@shared/api/dto';
import type { SpriteSheet } from '@shared/pipeline/sprite-sheet';
import type { Frame } from '@shared/pipeline/types';
import { AppError, notFound } from '../../core/app-error';
import { ReadCache } from '../../core/read-cache';
import { decodeImage, framesOf } from '../../render/decode';
import { BlobNotFound } from '../../storage/blob-store';
import type { FileStore } from '../../storage/file-store';
import { record } from '../activity/activity.model';
import { Artwork } from './artwork.model';
import { withoutControls } from '@shared/api/text.schema';

const FOLDER = 'artworks';
const THUMB_PX = 256;

export const artworkDto = (a: Artwork): ArtworkDto => {
  const base = `/api/studios/${a.studioId}/artworks/${a.id}`;
  return {
    id: a.id,
    name: a.name,
    type: a.type,
    width: a.width,
    height: a.height,
    frameCount: a.frameCount,
    delaysMs: a.delaysMs,
    bytes: a.bytes,
    sheet: a.sheet,
    createdAt: a.createdAt.toISOString(),
    updatedAt: a.updatedAt.toISOString(),
    originalUrl: `${base}/original`,
    thumbnailUrl: `${base}/thumbnail`,
    framesUrl: `${base}/frames`,
  };
};

/**
 * The hot reads of a library — its list, one artwork, a thumbnail — served from memory for a few
 * seconds; any write to artworks or studios empties them (server/db/models.ts).
 */
export const LIBRARY_CACHE_MS = 5_000;
export const libraryCache = new ReadCache<readonly ArtworkDto[]>('artwork-lists', LIBRARY_CACHE_MS, { maxEntries: 2_000 });
export const artworkCache = new ReadCache<ArtworkDto | null>('artworks', LIBRARY_CACHE_MS, { maxEntries: 20_000 });
export const thumbnailCache = new ReadCache<Buffer>('thumbnails', 60_000, {
  maxEntries: 5_000,
  maxSize: 32 * 1024 * 1024,
  sizeOf: (b) => b.length,
});

/** A studio's artwork library: uploads, thumbnails, decoded frames. */
export class ArtworksService {
  constructor(
    private readonly files: FileStore,
    /** Decodes a stored original into frames; the render engine's cached decoder in the app. */
    private readonly decode: (bytes: Buffer, sheet: SpriteSheet | null) => Promise<Frame[]> = async (bytes, sheet) =>
      framesOf(await decodeImage(bytes, undefined, sheet), sheet),
  ) {}

  list(studioId: string, q: string | undefined, sort: 'newest' | 'oldest' | 'name'): Promise<readonly ArtworkDto[]> {
    return libraryCache.read(JSON.stringify([studioId, q ?? '', sort]), async () => {
      const order: Order = sort === 'name' ? [['name', 'ASC']] : [['createdAt', sort === 'oldest' ? 'ASC' : 'DESC']];
      const where = q ? { studioId, name: { [Op.iLike]: `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%` } } : { studioId };
      return (await Artwork.findAll({ where, order, limit: 500 })).map(artworkDto);
    });
  }

  /** One artwork as the API shows it, for reads (through artworkCache); 404 when not in the studio. */
  async find(studioId: string, id: string): Promise<ArtworkDto> {
    const dto = await artworkCache.read(`${studioId}/${id}`, async () => {
      const a = await Artwork.findOne({ where: { id, studioId } });
      return a && artworkDto(a);
    });
    if (!dto) throw notFound('The artwork');
    return dto;
  }

  async get(studioId: string, id: string): Promise<Artwork> {
    const a = await Artwork.findOne({ where: { id, studioId } });
    if (!a) throw notFound('The artwork');
    return a;
  }

  /** The studio's artwork with this id (null when it is not the studio's), or with no id its newest (null when it has none). */
  pick(studioId: string, id?: string): Promise<Artwork | null> {
    return id ? Artwork.findOne({ where: { id, studioId } }) : Artwork.findOne({ where: { studioId }, order: [['createdAt', 'DESC']] });
  }

  /** Those of the given artworks that are the studio's. */
  pickAll(studioId: string, ids: readonly string[]): Promise<Artwork[]> {
    return Artwork.findAll({ where: { id: [...ids], studioId } });
  }

  /** Decodes (type by content, limits first), writes original and thumbnail, then the row. */
  async upload(
    studioId: string,
    userId: string,
    bytes: Buffer,
    fileName: string,
    fields: { name?: string; frameWidth?: number; frameHeight?: number; frameDelayMs?: number },
    transaction?: Transaction,
  ): Promise<ArtworkDto> {
    const sheet: SpriteSheet | null =
      fields.frameWidth && fields.frameHeight
        ? { frameWidth: fields.frameWidth, frameHeight: fields.frameHeight, frameDelayMs: fields.frameDelayMs ?? 100 }
        : null;
    const decoded = await decodeImage(bytes, undefined, sheet);
    const frames = framesOf(decoded, sheet);
    const first = frames[0].image;
    const thumbnail = await sharp(Buffer.from(first.data.buffer, first.data.byteOffset, first.data.byteLength), {
      raw: { width: first.width, height: first.height, channels: 4 },
    })
      .resize(THUMB_PX, THUMB_PX, { fit: 'inside', kernel: first.width < THUMB_PX ? 'nearest' : 'lanczos3', withoutEnlargement: false })
      .png()
      .toBuffer();
    const id = randomUUID();
    // Files first, then the row: a crash between leaves an orphan folder that start-up removes.
    await this.files.write(FOLDER, id, 'original', bytes);
    await this.files.write(FOLDER, id, 'thumbnail.png', thumbnail);
    try {
      const fromFile = withoutControls(fileName.replace(/\.[^.]+$/, ''));
      const name = (fields.name ?? fromFile).slice(0, 120) || 'Untitled';
      const row = await Artwork.create(
        {
          id,
          studioId,
          name,
          type: decoded.type,
          width: first.width,
          height: first.height,
          frameCount: frames.length,
          delaysMs: frames.map((f) => f.delayMs),
          bytes: bytes.length,
          sheet,
          createdById: userId,
        },
        { transaction },
      );
      await record(
        studioId,
        userId,
        'artwork.uploaded',
        `uploaded artwork “${name}”${frames.length > 1 ? ` (${frames.length} frames)` : ''}`,
        transaction,
      );
      return artworkDto(row);
    } catch (err) {
      await this.files.remove(FOLDER, id);
      throw err;
    }
  }

  async rename(studioId: string, userId: string, id: string, name: string): Promise<ArtworkDto> {
    const a = await this.get(studioId, id);
    const before = a.name;
    await a.update({ name });
    if (before !== name) await record(studioId, userId, 'artwork.renamed', `renamed artwork “${before}” to “${name}”`);
    return artworkDto(a);
  }

  async remove(studioId: string, userId: string, id: string): Promise<void> {
    const a = await this.get(studioId, id);
    await a.destroy();
    await record(studioId, userId, 'artwork.deleted', `deleted artwork “${a.name}”`);
    await this.files.remove(FOLDER, id);
  }

  original(id: string): Promise<Buffer> {
    return this.readFile(id, 'original');
  }

  thumbnail(id: string): Promise<Buffer> {
    return thumbnailCache.read(id, () => this.readFile(id, 'thumbnail.png'));
  }

  private readFile(id: string, name: string): Promise<Buffer> {
    return this.files.read(FOLDER, id, name).catch((err: unknown) => {
      if (err instanceof BlobNotFound)
        throw new AppError(404, 'file_missing', "The artwork's stored file is missing. Delete the artwork and upload it again.");
      throw err;
    });
  }

  /** The frames exactly as the reference renderer sees them. */
  async frames(a: Pick<ArtworkDto, 'id' | 'sheet'>): Promise<Frame[]> {
    return this.decode(await this.original(a.id), a.sheet);
  }

  /** Removes the files of artworks whose rows are already gone (a deleted studio's). */
  async removeFiles(ids: string[]): Promise<void> {
    for (const id of ids) await this.files.remove(FOLDER, id);
  }

  /** Removes storage folders without a row (left by a crash between file write and commit). */
  async reconcile(): Promise<number> {
    const ids = await this.files.ids(FOLDER);
    if (!ids.length) return 0;
    const known = new Set(
      (await Artwork.findAll({ attributes: ['id'], where: { id: ids.filter((i) => /^[0-9a-f-]{36}$/.test(i)) } })).map((a) => a.id),
    );
    const orphans = ids.filter((i) => !known.has(i));
    for (const id of orphans) await this.files.remove(FOLDER, id).catch(() => undefined);
    return orphans.length;
  }
}
