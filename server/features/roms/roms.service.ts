import { createHash } from 'node:crypto';
import type { RomPatchRecord, VideoRomDetailDto, VideoRomDto } from '@shared/api/dto';
import type { RomPatchBody } from '@shared/api/rom.schema';
import { patchRom, readRom, romHeader, RomError } from '@shared/drive/vga-rom';
import { AppError, conflict, notFound } from '../../core/app-error';
import { record } from '../activity/activity.model';
import type { TimingsService } from '../timings/timings.service';
import { VideoRom } from './rom.model';
import { withoutControls } from '@shared/api/text.schema';

/** Images a studio keeps (each at most 512 KiB). */
export const MAX_ROMS_PER_STUDIO = 100;

/** A RomError as the API answers it: 422 with the code and the reason. */
const unprocessable = (err: RomError) =>
  new AppError(err.code === 'too_large' ? 413 : 422, err.code, `${err.message.charAt(0).toUpperCase()}${err.message.slice(1)}.`);

const sha256 = (b: Uint8Array) => createHash('sha256').update(b).digest('hex');

/** Names come from file names and timings: no control characters, at most 120 characters. */
const cleanName = (name: string) => withoutControls(name).slice(0, 120) || 'Video BIOS';

/** A studio's video option ROM images: upload, read, patch with a saved timing, download. */
export class RomsService {
  constructor(private readonly timings: TimingsService) {}

  private async dto(row: VideoRom): Promise<VideoRomDto> {
    const children = await VideoRom.findAll({ where: { patchedFromId: row.id }, attributes: ['id'], order: [['createdAt', 'ASC']] });
    return this.dtoWith(
      row,
      children.map((c) => c.id),
    );
  }

  private dtoWith(row: VideoRom, patchedIds: string[]): VideoRomDto {
    let checksumOk = false;
    try {
      checksumOk = romHeader(row.bytes).checksum.ok;
    } catch {
      checksumOk = false;
    }
    return {
      id: row.id,
      name: row.name,
      size: row.size,
      sha256: row.sha256,
      checksumOk,
      patchedFromId: row.patchedFromId,
      patch: row.patch,
      patchedIds,
      createdAt: row.createdAt.toISOString(),
      imageUrl: `/api/studios/${row.studioId}/roms/${row.id}/image`,
    };
  }

  async list(studioId: string): Promise<VideoRomDto[]> {
    const rows = await VideoRom.findAll({ where: { studioId }, order: [['createdAt', 'DESC']], limit: 200 });
    const children = new Map<string, string[]>();
    for (const r of rows) if (r.patchedFromId) children.set(r.patchedFromId, [...(children.get(r.patchedFromId) ?? []), r.id]);
    return rows.map((r) => this.dtoWith(r, children.get(r.id)?.reverse() ?? []));
  }

  private async row(studioId: string, id: string): Promise<VideoRom> {
    const row = await VideoRom.findOne({ where: { id, studioId } });
    if (!row) throw notFound('The ROM image');
    return row;
  }

  /** Refuses what is not an option ROM (or is cut short) before anything is stored. */
  async upload(studioId: string, userId: string, bytes: Buffer, fileName: string, name?: string): Promise<VideoRomDto> {
    if ((await VideoRom.count({ where: { studioId } })) >= MAX_ROMS_PER_STUDIO)
      throw new AppError(
        422,
        'too_many_roms',
        `A studio keeps at most ${MAX_ROMS_PER_STUDIO} ROM images; delete some you no longer need first.`,
      );
    try {
      romHeader(bytes);
    } catch (err) {
      if (err instanceof RomError) throw unprocessable(err);
      throw err;
    }
    const row = await VideoRom.create({
      studioId,
      name: cleanName(name ?? fileName.replace(/\.[^.]+$/, '')),
      bytes,
      size: bytes.length,
      sha256: sha256(bytes),
      patchedFromId: null,
      patch: null,
      createdById: userId,
    });
    await record(studioId, userId, 'rom.uploaded', `uploaded video BIOS image “${row.name}” (${bytes.length} bytes)`);
    return this.dto(row);
  }

  async detail(studioId: string, id: string, tableOffset?: number): Promise<VideoRomDetailDto> {
    const row = await this.row(studioId, id);
    try {
      return { rom: await this.dto(row), info: readRom(row.bytes, { tableOffset }), problem: null };
    } catch (err) {
      if (err instanceof RomError)
        return { rom: await this.dto(row), info: null, problem: { code: err.code, message: unprocessable(err).message } };
      throw err;
    }
  }

  async image(studioId: string, id: string): Promise<{ name: string; bytes: Buffer }> {
    const row = await this.row(studioId, id);
    return { name: row.name, bytes: row.bytes };
  }

  /**
   * Patches one entry with a saved timing into a new image beside the original. An image that
   * was patched already is refused (patch the patched one, so both changes are in one file), and
   * starting from a patched image needs the user's word (startFromPatched).
   */
  async patch(studioId: string, userId: string, id: string, body: RomPatchBody): Promise<{ rom: VideoRomDto; patch: RomPatchRecord }> {
    const saved = await this.timings.get(studioId, body.timingId);
    return VideoRom.sequelize!.transaction(async (transaction) => {
      const source = await VideoRom.findOne({ where: { id, studioId }, lock: transaction.LOCK.UPDATE, transaction });
      if (!source) throw notFound('The ROM image');
      const later = await VideoRom.findOne({ where: { patchedFromId: source.id }, order: [['createdAt', 'DESC']], transaction });
      if (later)
        throw conflict(
          'already_patched',
          `“${source.name}” was patched already, into “${later.name}”. Patch that image instead, so both changes end up in one file.`,
          { patchedId: later.id, patchedName: later.name },
        );
      if (source.patchedFromId && !body.startFromPatched)
        throw conflict(
          'confirm_patched',
          `“${source.name}” is itself a patched image. Confirm that you start from it (startFromPatched) to patch it again.`,
          { patchedFromId: source.patchedFromId },
        );
      let result;
      let offset = 0;
      try {
        const info = readRom(source.bytes, { tableOffset: body.tableOffset });
        result = patchRom(source.bytes, info, body.entryIndex, saved.timing, { checksumAt: body.checksumAt });
        offset = info.entries.find((e) => e.index === body.entryIndex)!.offset;
      } catch (err) {
        if (err instanceof RomError) throw unprocessable(err);
        if (err instanceof RangeError)
          throw new AppError(422, 'timing_unfit', `A VGA CRT controller cannot hold “${saved.name}”: ${err.message}.`);
        throw err;
      }
      const patch: RomPatchRecord = {
        entryIndex: body.entryIndex,
        entryOffset: offset,
        timingId: saved.id,
        timingName: saved.name,
        mode: saved.timing.name,
        changes: result.changes,
        checksum: result.checksum,
        notes: result.notes,
      };
      const bytes = Buffer.from(result.bytes);
      const name = cleanName(`${source.name.slice(0, 80)} · ${saved.name}`);
      const row = await VideoRom.create(
        { studioId, name, bytes, size: bytes.length, sha256: sha256(bytes), patchedFromId: source.id, patch, createdById: userId },
        { transaction },
      );
      await record(
        studioId,
        userId,
        'rom.patched',
        `patched entry ${body.entryIndex} of “${source.name}” with “${saved.name}” (${result.changes.length} bytes changed)`,
        transaction,
      );
      return { rom: this.dtoWith(row, []), patch };
    });
  }

  async rename(studioId: string, id: string, name: string): Promise<VideoRomDto> {
    const row = await this.row(studioId, id);
    await row.update({ name: cleanName(name) });
    return this.dto(row);
  }

  async remove(studioId: string, userId: string, id: string): Promise<void> {
    const row = await this.row(studioId, id);
    await row.destroy();
    await record(studioId, userId, 'rom.deleted', `deleted video BIOS image “${row.name}”`);
  }
}
