import type { Request } from 'express';
import { romDetailQuerySchema, romPatchSchema, romUploadFieldsSchema } from '@shared/api/rom.schema';
import { renameArtworkSchema } from '@shared/api/artwork.schema';
import { ApiRouter } from '../../core/api-router';
import { idParam, studioRole } from '../../core/policy';
import type { RomsService } from './roms.service';

/**
 * /api/studios/:studioId/roms: video option ROM images. A card's BIOS is someone's firmware and
 * a patched one can stop a card from starting, so only editors and owners see or change them.
 */
export function romsRoutes(roms: RomsService): ApiRouter {
  const api = new ApiRouter('/studios/:studioId/roms', 'Video BIOS');
  const romId = (req: Pick<Request, 'params'>) => idParam(req, 'romId', 'The ROM image');

  api.route('get', '/', { policy: studioRole('editor'), summary: "The studio's ROM images, newest first" }, async (req, res) => {
    res.json({ roms: await roms.list(req.membership.studioId) });
  });
  api.route(
    'post',
    '/',
    {
      policy: studioRole('editor'),
      summary: 'Upload a ROM image (multipart field "file", optional name); refused unless it starts with an option ROM header',
      upload: { fields: romUploadFieldsSchema, file: 'the ROM image' },
      status: 201,
    },
    async (req, res) => {
      res
        .status(201)
        .json({ rom: await roms.upload(req.membership.studioId, req.user.id, req.file.buffer, req.file.originalname, req.body.name) });
    },
  );
  api.route(
    'get',
    '/:romId',
    {
      policy: studioRole('editor'),
      summary: 'One image with its header, checksum and parameter table (read at tableOffset when given)',
      query: romDetailQuerySchema,
    },
    async (req, res) => {
      res.json(await roms.detail(req.membership.studioId, romId(req), req.query.tableOffset));
    },
  );
  api.route('get', '/:romId/image', { policy: studioRole('editor'), summary: 'The image bytes, as a download' }, async (req, res) => {
    const { name, bytes } = await roms.image(req.membership.studioId, romId(req));
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
      res.status(201).json(await roms.patch(req.membership.studioId, req.user.id, romId(req), req.body));
    },
  );
  api.route(
    'patch',
    '/:romId',
    { policy: studioRole('editor'), summary: 'Rename an image', body: renameArtworkSchema },
    async (req, res) => {
      res.json({ rom: await roms.rename(req.membership.studioId, romId(req), req.body.name) });
    },
  );
  api.route(
    'delete',
    '/:romId',
    { policy: studioRole('editor'), summary: 'Delete an image (images patched from it stay)', status: 204 },
    async (req, res) => {
      await roms.remove(req.membership.studioId, req.user.id, romId(req));
      res.status(204).end();
    },
  );
  return api;
}
