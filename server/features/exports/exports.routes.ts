import type { Request } from 'express';
import { animationRequestSchema, exportFileQuerySchema, exportLinkSchema, sheetRequestSchema } from '@shared/api/export.schema';
import { ApiRouter, type StudioCaller } from '../../core/api-router';
import { AppError } from '../../core/app-error';
import { idParam, publicAccess, studioRole } from '../../core/policy';
import { signDownload, verifyDownload } from '../../core/signed-links';
import type { BlobStore } from '../../storage/blob-store';
import type { ExportsService } from './exports.service';

/** /api/studios/:studioId/exports: comparison sheets made as background jobs. Viewers download, editors ask, owners delete anyone's. */
export function exportsRoutes(exports: ExportsService, secret: string, appUrl: string): ApiRouter {
  const api = new ApiRouter('/studios/:studioId/exports', 'Exports');
  const exportId = (req: Pick<Request, 'params'>) => idParam(req, 'exportId', 'The export');
  const actor = (req: StudioCaller) => req.membership;

  api.route(
    'get',
    '/',
    { policy: studioRole('viewer'), summary: "The studio's exports, newest first, with each job's progress" },
    async (req, res) => {
      res.json({ exports: await exports.list(req.membership.studioId) });
    },
  );
  api.route(
    'post',
    '/',
    {
      policy: studioRole('editor'),
      summary: 'Ask for a comparison sheet (artworks × looks, a layout, a scale); checked in full, then queued',
      body: sheetRequestSchema,
      status: 202,
    },
    async (req, res) => {
      res.status(202).json({ export: await exports.create(actor(req), req.body) });
    },
  );
  api.route(
    'post',
    '/animations',
    {
      policy: studioRole('editor'),
      summary:
        'Ask for an animated export (one animation through one look, as APNG and GIF with a flash check); checked in full, then queued',
      body: animationRequestSchema,
      status: 202,
    },
    async (req, res) => {
      res.status(202).json({ export: await exports.createAnimation(actor(req), req.body) });
    },
  );
  api.route('get', '/:exportId', { policy: studioRole('viewer'), summary: 'One export and its progress' }, async (req, res) => {
    res.json({ export: await exports.get(req.membership.studioId, exportId(req)) });
  });
  api.route(
    'get',
    '/:exportId/file',
    {
      policy: studioRole('viewer'),
      summary:
        'Download a finished file: a sheet as png (the default), pdf or zip (single renders and a manifest), an animation as apng, gif or json (its manifest with the flash check). Answers 303 to a signed link that works for 15 minutes without a session; 409 until the export is ready',
      query: exportFileQuerySchema,
    },
    async (req, res) => {
      const url = await exports.downloadUrl(
        req.membership.studioId,
        exportId(req),
        req.query.format,
        (d) => `/api/downloads/${signDownload(secret, d)}`,
      );
      res.set('Cache-Control', 'private, no-store').redirect(303, url);
    },
  );
  api.route(
    'get',
    '/:exportId/links',
    { policy: studioRole('editor'), summary: "The export's read-only share links" },
    async (req, res) => {
      res.json({ links: await exports.links(req.membership.studioId, exportId(req)) });
    },
  );
  api.route(
    'post',
    '/:exportId/links',
    {
      policy: studioRole('editor'),
      summary: 'Make a read-only share link to a finished export (optional expiresInDays); the URL is shown once',
      body: exportLinkSchema,
      status: 201,
    },
    async (req, res) => {
      res.status(201).json({ link: await exports.createLink(actor(req), exportId(req), req.body, appUrl) });
    },
  );
  api.route(
    'delete',
    '/:exportId/links/:linkId',
    { policy: studioRole('editor'), summary: 'Revoke a share link', status: 204 },
    async (req, res) => {
      await exports.revokeLink(actor(req), exportId(req), idParam(req, 'linkId', 'The link'));
      res.status(204).end();
    },
  );
  api.route(
    'post',
    '/:exportId/cancel',
    {
      policy: studioRole('editor'),
      summary: "Stop a waiting or running export (your own, or anyone's as an owner); partial output is removed",
    },
    async (req, res) => {
      res.json({ export: await exports.cancel(actor(req), exportId(req)) });
    },
  );
  api.route(
    'post',
    '/:exportId/retry',
    { policy: studioRole('editor'), summary: 'Queue a failed or cancelled export again' },
    async (req, res) => {
      res.json({ export: await exports.retry(actor(req), exportId(req)) });
    },
  );
  api.route(
    'delete',
    '/:exportId',
    { policy: studioRole('editor'), summary: "Delete an export and its file (your own, or anyone's as an owner)", status: 204 },
    async (req, res) => {
      await exports.remove(actor(req), exportId(req));
      res.status(204).end();
    },
  );
  return api;
}

/** /api/downloads/<token>: a file behind a link the app signed (exports on disk), no session needed until it expires. */
export function downloadRoutes(blobs: BlobStore, secret: string): ApiRouter {
  const api = new ApiRouter('/downloads', 'Exports');
  api.route(
    'get',
    '/:token',
    {
      policy: publicAccess,
      summary: 'A file behind a signed, expiring download link (404 when the link is not valid, 410 once it has expired)',
    },
    async (req, res) => {
      const d = verifyDownload(secret, String(req.params.token));
      const bytes = await blobs.get(d.key).catch(() => {
        throw new AppError(404, 'not_found', 'The file behind this link is gone: the export was deleted.');
      });
      res.set({
        'Content-Type': d.contentType,
        'X-Content-Type-Options': 'nosniff',
        'Content-Disposition': `attachment; filename="${d.fileName.replace(/[^\w .-]/g, '_')}"`,
        'Cache-Control': 'private, no-store',
        'Referrer-Policy': 'no-referrer',
      });
      res.send(bytes);
    },
  );
  return api;
}

/** /api/shared-exports/<token>: what an export's share link opens, read-only, no account needed. */
export function sharedExportRoutes(exports: ExportsService, secret: string): ApiRouter {
  const api = new ApiRouter('/shared-exports', 'Exports');
  const token = (req: Pick<Request, 'params'>) => String(req.params.token);
  api.route(
    'get',
    '/:token',
    { policy: publicAccess, summary: 'A shared export: what it shows and its files (404 for unknown, revoked or expired links)' },
    async (req, res) => {
      res.set('Referrer-Policy', 'no-referrer').json({ export: await exports.shared(token(req)) });
    },
  );
  api.route(
    'get',
    '/:token/preview',
    { policy: publicAccess, summary: "A shared sheet's PNG, to show on the link's page" },
    async (req, res) => {
      res
        .set({
          'Content-Type': 'image/png',
          'X-Content-Type-Options': 'nosniff',
          'Cache-Control': 'private, no-store',
          'Referrer-Policy': 'no-referrer',
        })
        .send(await exports.sharedPreview(token(req)));
    },
  );
  api.route(
    'get',
    '/:token/file',
    {
      policy: publicAccess,
      summary: "Download a shared export's file: 303 to a signed link that works for 15 minutes",
      query: exportFileQuerySchema,
    },
    async (req, res) => {
      const url = await exports.sharedDownloadUrl(token(req), req.query.format, (d) => `/api/downloads/${signDownload(secret, d)}`);
      res.set({ 'Cache-Control': 'private, no-store', 'Referrer-Policy': 'no-referrer' }).redirect(303, url);
    },
  );
  return api;
}
