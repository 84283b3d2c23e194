import type { Request } from 'express';
import { artworkListQuerySchema, renameArtworkSchema, studioRenderSchema, uploadFieldsSchema } from '@shared/api/artwork.schema';
import { ApiRouter } from '../../core/api-router';
import { idParam, studioRole } from '../../core/policy';
import { resolveParameters, type RendersService } from '../renders/renders.service';
import type { PresetsService } from '../presets/presets.service';
import type { ArtworksService } from './artworks.service';

const png = { 'Content-Type': 'image/png', 'X-Content-Type-Options': 'nosniff' };
const MIME = { png: 'image/png', gif: 'image/gif', jpeg: 'image/jpeg', webp: 'image/webp' } as const;

/** /api/studios/:studioId/artworks and studio renders. */
export function artworksRoutes(artworks: ArtworksService, renders: RendersService, presets: PresetsService): ApiRouter {
  const api = new ApiRouter('/studios/:studioId', 'Artworks');
  const artworkId = (req: Pick<Request, 'params'>) => idParam(req, 'artworkId', 'The artwork');

  api.route(
    'get',
    '/artworks',
    { policy: studioRole('viewer'), summary: 'The library, searched by name and sorted', query: artworkListQuerySchema },
    async (req, res) => {
      res.json({ artworks: await artworks.list(req.membership.studioId, req.query.q, req.query.sort) });
    },
  );
  api.route(
    'post',
    '/artworks',
    {
      policy: studioRole('editor'),
      summary: 'Upload an image (multipart field "file"; optional name, frameWidth/frameHeight/frameDelayMs for a sprite sheet)',
      upload: { fields: uploadFieldsSchema, file: 'the image' },
      status: 201,
    },
    async (req, res) => {
      res
        .status(201)
        .json({ artwork: await artworks.upload(req.membership.studioId, req.user.id, req.file.buffer, req.file.originalname, req.body) });
    },
  );
  api.route('get', '/artworks/:artworkId', { policy: studioRole('viewer'), summary: 'One artwork' }, async (req, res) => {
    res.json({ artwork: await artworks.find(req.membership.studioId, artworkId(req)) });
  });
  api.route(
    'patch',
    '/artworks/:artworkId',
    { policy: studioRole('editor'), summary: 'Rename an artwork', body: renameArtworkSchema },
    async (req, res) => {
      res.json({ artwork: await artworks.rename(req.membership.studioId, req.user.id, artworkId(req), req.body.name) });
    },
  );
  api.route(
    'delete',
    '/artworks/:artworkId',
    { policy: studioRole('editor'), summary: 'Delete an artwork and its files', status: 204 },
    async (req, res) => {
      const a = await artworks.get(req.membership.studioId, artworkId(req));
      await renders.removeFor({ artworkId: a.id });
      await artworks.remove(a.studioId, req.user.id, a.id);
      res.status(204).end();
    },
  );
  api.route(
    'get',
    '/artworks/:artworkId/links',
    { policy: studioRole('editor'), summary: 'The live share links that show this artwork (what a delete would take the picture from)' },
    async (req, res) => {
      const a = await artworks.find(req.membership.studioId, artworkId(req));
      res.json({ links: await presets.liveLinksShowing(req.membership.studioId, a.id) });
    },
  );
  api.route(
    'get',
    '/artworks/:artworkId/original',
    { policy: studioRole('viewer'), summary: 'The uploaded file as it was' },
    async (req, res) => {
      const a = await artworks.find(req.membership.studioId, artworkId(req));
      const safeName = a.name.replace(/[^\w .-]/g, '_');
      res.set({
        'Content-Type': MIME[a.type],
        'X-Content-Type-Options': 'nosniff',
        'Content-Disposition': `attachment; filename="${safeName}.${a.type === 'jpeg' ? 'jpg' : a.type}"`,
      });
      res.send(await artworks.original(a.id));
    },
  );
  api.route(
    'get',
    '/artworks/:artworkId/thumbnail',
    { policy: studioRole('viewer'), summary: 'A PNG thumbnail (at most 256 px)' },
    async (req, res) => {
      const a = await artworks.find(req.membership.studioId, artworkId(req));
      res.set({ ...png, 'Content-Disposition': 'inline; filename="thumbnail.png"', 'Cache-Control': 'private, max-age=3600' });
      res.send(await artworks.thumbnail(a.id));
    },
  );
  api.route(
    'get',
    '/artworks/:artworkId/frames',
    { policy: studioRole('viewer'), summary: 'The decoded frames as raw RGBA, one after another (what the reference renderer sees)' },
    async (req, res) => {
      const a = await artworks.find(req.membership.studioId, artworkId(req));
      const frames = await artworks.frames(a);
      res.set({
        'Content-Type': 'application/octet-stream',
        'X-Content-Type-Options': 'nosniff',
        'Content-Disposition': 'attachment; filename="frames.rgba"',
        'Cache-Control': 'private, max-age=3600',
      });
      res.send(Buffer.concat(frames.map((f) => Buffer.from(f.image.data.buffer, f.image.data.byteOffset, f.image.data.byteLength))));
    },
  );
  api.route(
    'post',
    '/renders',
    {
      policy: studioRole('viewer'),
      summary: 'Reference render of a studio artwork with a preset (and patch) or parameters',
      body: studioRenderSchema,
    },
    async (req, res) => {
      const a = await artworks.get(req.membership.studioId, req.body.artworkId);
      const parameters = resolveParameters(req.body);
      const render = await renders.render(
        { studioId: a.studioId, artworkId: a.id, userId: req.user.id },
        { input: await artworks.original(a.id), sheet: a.sheet, parameters, scale: req.body.scale, frame: req.body.frame },
      );
      res.status(render.cached ? 200 : 201).json({ render });
    },
  );
  api.route(
    'get',
    '/renders/:key',
    { policy: studioRole('viewer'), summary: "A stored reference render of one of the studio's artworks, as PNG" },
    async (req, res) => {
      const key = String(req.params.key);
      const bytes = await renders.read(key, { studioId: req.membership.studioId });
      res.set({
        ...png,
        'Content-Disposition': `inline; filename="render-${key.slice(0, 12)}.png"`,
        'Cache-Control': 'private, max-age=31536000, immutable',
      });
      res.send(bytes);
    },
  );
  return api;
}
