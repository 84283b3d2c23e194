import { romPatchSchema, romUploadFieldsSchema } from '../../../shared/api/rom.schema';
import { renameArtworkSchema } from '../../../shared/api/artwork.schema';
import { ApiRouter } from '../../core/api-router';
import { AppError } from '../../core/app-error';
import { idParam, studioRole } from '../../core/policy';
import { uploadOne } from '../../core/upload';
import { parseOrThrow } from '../../core/validate';
import type { RomsService } from './roms.service';

/**
 * /api/studios/:studioId/roms: video option ROM images. A card's BIOS is someone's firmware and
 * a patched one can stop a card from starting, so only editors and owners see or change them.
 */
export function romsRoutes(roms: RomsService): ApiRouter {
  const api = new ApiRouter('/studios/:studioId/roms', 'Video BIOS');
  const romId = (req: Parameters<typeof idParam>[0]) => idParam(req, 'romId', 'The ROM image');

  api.route('get', '/', { policy: studioRole('editor'), summary: "The studio's ROM images, newest first" }, async (req, res) => {
    res.json({ roms: await roms.list(req.membership!.studioId) });
  });
  api.route(
    'post',
    '/',
    {
      policy: studioRole('editor'),
      summary: 'Upload a ROM image (multipart field "file", optional name); refused unless it starts with an option ROM header',
      status: 201,
    },
    uploadOne,
    async (req, res) => {
      const fields = parseOrThrow(romUploadFieldsSchema, req.body ?? {}, 'upload fields');
      if (!req.file) throw new AppError(400, 'invalid_input', 'Attach the ROM image as the multipart field "file".');
      res
        .status(201)
        .json({ rom: await roms.upload(req.membership!.studioId, req.user!.id, req.file.buffer, req.file.originalname, fields.name) });
    },
  );
  api.route(
    'get',
    '/:romId',
    {
      policy: studioRole('editor'),
      summary: 'One image with its header, checksum and parameter table (?tableOffset= to read the table at an offset)',
    },
    async (req, res) => {
      const raw = typeof req.query.tableOffset === 'string' ? req.query.tableOffset.trim() : '';
      const tableOffset = raw === '' ? undefined : Number(raw.startsWith('0x') ? parseInt(raw.slice(2), 16) : raw);
      if (tableOffset !== undefined && !Number.isInteger(tableOffset))
        throw new AppError(400, 'invalid_input', `tableOffset must be a whole number (decimal or 0x… hex), got "${raw.slice(0, 20)}".`);
      res.json(await roms.detail(req.membership!.studioId, romId(req), tableOffset));
    },
  );
  api.route('get', '/:romId/image', { policy: studioRole('editor'), summary: 'The image bytes, as a download' }, async (req, res) => {
    const { name, bytes } = await roms.image(req.membership!.studioId, romId(req));
    const safeName = name.replace(/[^\w .-]/g, '_');
    res.set({
      'Content-Type': 'application/octet-stream',
      'X-Content-Type-Options': 'nosniff',
      'Content-Disposition': `attachment; filename="${safeName}.rom"`,
      'Cache-Control': 'private, no-store',
    });
    res.send(bytes);
  });
  api.route(
    'post',
    '/:romId/patch',
    {
      policy: studioRole('editor'),
      summary: 'Patch one parameter-table entry with a saved drive timing into a new image; answers the image and the byte diff',
      body: romPatchSchema,
      status: 201,
    },
    async (req, res) => {
      res.status(201).json(await roms.patch(req.membership!.studioId, req.user!.id, romId(req), req.body));
    },
  );
  api.route(
    'patch',
    '/:romId',
    { policy: studioRole('editor'), summary: 'Rename an image', body: renameArtworkSchema },
    async (req, res) => {
      res.json({ rom: await roms.rename(req.membership!.studioId, romId(req), req.body.name) });
    },
  );
  api.route(
    'delete',
    '/:romId',
    { policy: studioRole('editor'), summary: 'Delete an image (images patched from it stay)', status: 204 },
    async (req, res) => {
      await roms.remove(req.membership!.studioId, req.user!.id, romId(req));
      res.status(204).end();
    },
  );
  return api;
}
