import type { Request } from 'express';
import {
  createPresetSchema,
  duplicatePresetSchema,
  presetDocumentSchema,
  presetListQuerySchema,
  presetThumbnailQuerySchema,
  referenceSchema,
  restoreSchema,
  shareLinkSchema,
  updatePresetSchema,
} from '@shared/api/preset.schema';
import { ApiRouter, type StudioCaller } from '../../core/api-router';
import { AppError } from '../../core/app-error';
import { idParam, publicAccess, studioRole } from '../../core/policy';
import { issuesOf } from '../../core/validate';
import { fieldLabel, plainMessage } from '@shared/model/param-diff';
import type { ArtworksService } from '../artworks/artworks.service';
import type { RendersService } from '../renders/renders.service';
import type { Actor, PresetsService } from './presets.service';

const actorOf = (req: StudioCaller): Actor => ({ studioId: req.membership.studioId, userId: req.user.id, role: req.membership.role });
const presetId = (req: Pick<Request, 'params'>) => idParam(req, 'presetId', 'The preset');

/** /api/studios/:studioId/presets: versioned presets, reference lock, share links, import/export. */
export function presetsRoutes(presets: PresetsService, appUrl: string, artworks: ArtworksService, renders: RendersService): ApiRouter {
  const api = new ApiRouter('/studios/:studioId/presets', 'Presets');

  api.route(
    'get',
    '/',
    {
      policy: studioRole('viewer'),
      summary: 'Presets, filtered by panel type, searched by name, sorted and paged',
      query: presetListQuerySchema,
    },
    async (req, res) => {
      const { q, ...rest } = req.query;
      res.json(await presets.list(req.membership.studioId, { ...rest, search: q }));
    },
  );
  api.route(
    'post',
    '/',
    {
      policy: studioRole('editor'),
      summary: "Create a preset from a panel type's defaults (or given parameters)",
      body: createPresetSchema,
      status: 201,
    },
    async (req, res) => {
      res.status(201).json({ preset: await presets.create(actorOf(req), req.body) });
    },
  );
  api.route(
    'post',
    '/import',
    { policy: studioRole('editor'), summary: 'Import a preset document; every error is reported with its JSON path', status: 201 },
    async (req, res) => {
      const parsed = presetDocumentSchema.safeParse(req.body);
      if (!parsed.success) {
        const issues = issuesOf(parsed.error).map((i) => {
          const path = i.path === '(root)' ? '$' : `$.${i.path}`;
          const label = fieldLabel(path);
          // A parameter's own message starts with its label: say it once.
          const message = plainMessage(i.message.startsWith(label) ? i.message.slice(label.length).trim() : i.message);
          return { path, label, message };
        });
        throw new AppError(
          400,
          'invalid_document',
          `The document has ${issues.length} error${issues.length === 1 ? '' : 's'}; nothing was imported.`,
          { issues },
        );
      }
      const { name, panelTypeId, parameters } = parsed.data;
      res.status(201).json({
        preset: await presets.create(
          actorOf(req),
          { name, panelTypeId, parameters },
          { message: 'Imported', numberName: true, how: 'imported' },
        ),
      });
    },
  );
  api.route('get', '/:presetId', { policy: studioRole('viewer'), summary: 'One preset at its current revision' }, async (req, res) => {
    res.json({ preset: await presets.get(req.membership.studioId, presetId(req)) });
  });
  api.route(
    'get',
    '/:presetId/thumbnail',
    {
      policy: studioRole('viewer'),
      summary: 'A small PNG of the preset on an artwork (by default the newest), made once per revision',
      query: presetThumbnailQuerySchema,
    },
    async (req, res) => {
      const { studioId } = req.membership;
      const preset = await presets.get(studioId, presetId(req));
      const wanted = req.query.artworkId;
      if (wanted !== undefined && !/^[0-9a-f-]{36}$/i.test(wanted)) throw new AppError(404, 'not_found', 'The artwork was not found.');
      const artwork = wanted ? await artworks.get(studioId, wanted) : (await artworks.list(studioId, undefined, 'newest'))[0];
      if (!artwork) throw new AppError(404, 'no_artwork', 'The studio has no artwork to show the preset on yet. Upload one in Artworks.');
      const a = await artworks.get(studioId, artwork.id);
      const png = await renders.thumbnail(
        { studioId, artworkId: a.id, userId: req.user.id },
        { input: await artworks.original(a.id), sheet: a.sheet, parameters: preset.parameters },
      );
      res.set({
        'Content-Type': 'image/png',
        'X-Content-Type-Options': 'nosniff',
        'Content-Disposition': 'inline; filename="thumbnail.png"',
        'Cache-Control': 'private, max-age=3600',
      });
      res.send(png);
    },
  );
  api.route(
    'patch',
    '/:presetId',
    {
      policy: studioRole('editor'),
      summary: 'Save a new revision (baseRevision must be the current one, else 409)',
      body: updatePresetSchema,
    },
    async (req, res) => {
      res.json({ preset: await presets.update(actorOf(req), presetId(req), req.body) });
    },
  );
  api.route(
    'delete',
    '/:presetId',
    { policy: studioRole('editor'), summary: 'Delete a preset (the reference look: owners only)', status: 204 },
    async (req, res) => {
      await presets.remove(actorOf(req), presetId(req));
      res.status(204).end();
    },
  );
  api.route(
    'get',
    '/:presetId/revisions',
    { policy: studioRole('viewer'), summary: 'Every revision, newest first, with its parameter changes' },
    async (req, res) => {
      res.json({ revisions: await presets.revisions(req.membership.studioId, presetId(req)) });
    },
  );
  api.route(
    'post',
    '/:presetId/revisions/:n/restore',
    { policy: studioRole('editor'), summary: 'Restore an old revision as a new one', body: restoreSchema },
    async (req, res) => {
      const n = Number(req.params.n);
      if (!Number.isInteger(n) || n < 1) throw new AppError(404, 'not_found', 'The revision was not found.');
      res.json({ preset: await presets.restore(actorOf(req), presetId(req), n, req.body.message) });
    },
  );
  api.route(
    'post',
    '/:presetId/duplicate',
    { policy: studioRole('viewer'), summary: 'Copy into a studio where you are an editor', body: duplicatePresetSchema, status: 201 },
    async (req, res) => {
      res.status(201).json({ preset: await presets.duplicate(actorOf(req), presetId(req), req.body.studioId, req.body.name) });
    },
  );
  api.route(
    'post',
    '/:presetId/reference',
    { policy: studioRole('owner'), summary: "Mark or unmark the studio's reference look (locked to owners)", body: referenceSchema },
    async (req, res) => {
      res.json({ preset: await presets.setReference(actorOf(req), presetId(req), req.body.isReference) });
    },
  );
  api.route(
    'get',
    '/:presetId/export',
    { policy: studioRole('viewer'), summary: 'The preset as an Emberline preset document (JSON)' },
    async (req, res) => {
      const p = await presets.get(req.membership.studioId, presetId(req));
      res.set('Content-Disposition', `attachment; filename="${p.name.replace(/[^\w .-]/g, '_')}.emberline-preset.json"`);
      res.json(presets.exportDocument(p));
    },
  );
  api.route('get', '/:presetId/links', { policy: studioRole('owner'), summary: 'Share links of a preset' }, async (req, res) => {
    res.json({ links: await presets.links(req.membership.studioId, presetId(req)) });
  });
  api.route(
    'post',
    '/:presetId/links',
    {
      policy: studioRole('owner'),
      summary: 'Create a read-only share link (optional artwork and expiry)',
      body: shareLinkSchema,
      status: 201,
    },
    async (req, res) => {
      res.status(201).json({ link: await presets.createLink(actorOf(req), presetId(req), req.body, appUrl) });
    },
  );
  api.route(
    'delete',
    '/:presetId/links/:linkId',
    { policy: studioRole('owner'), summary: 'Revoke a share link', status: 204 },
    async (req, res) => {
      await presets.revokeLink(actorOf(req), presetId(req), idParam(req, 'linkId', 'The link'));
      res.status(204).end();
    },
  );
  return api;
}

/** /api/share/:token: what a read-only link opens, without an account. */
export function shareRoutes(presets: PresetsService, artworks: ArtworksService): ApiRouter {
  const api = new ApiRouter('/share', 'Presets');
  api.route('get', '/:token', { policy: publicAccess, summary: 'The shared preset (and its artwork), read-only' }, async (req, res) => {
    res.set({ 'Referrer-Policy': 'no-referrer', 'Cache-Control': 'no-store' });
    res.json({ shared: (await presets.shared(String(req.params.token))).view });
  });
  api.route(
    'get',
    '/:token/frames',
    { policy: publicAccess, summary: "The shared artwork's decoded frames (raw RGBA)" },
    async (req, res) => {
      res.set({
        'Referrer-Policy': 'no-referrer',
        'Cache-Control': 'no-store',
        'Content-Type': 'application/octet-stream',
        'X-Content-Type-Options': 'nosniff',
      });
      const { artwork } = await presets.shared(String(req.params.token));
      if (!artwork) throw new AppError(404, 'not_found', 'This link shows no artwork.');
      const frames = await artworks.frames(artwork);
      res.send(Buffer.concat(frames.map((f) => Buffer.from(f.image.data.buffer, f.image.data.byteOffset, f.image.data.byteLength))));
    },
  );
  return api;
}
