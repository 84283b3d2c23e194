import type { RequestHandler } from 'express';
import { animationRequestSchema, EXPORT_FORMATS, sheetRequestSchema } from '../../../shared/api/export.schema';
import { ApiRouter } from '../../core/api-router';
import { AppError } from '../../core/app-error';
import { idParam, publicAccess, studioRole } from '../../core/policy';
import { signDownload, verifyDownload } from '../../core/signed-links';
import type { BlobStore } from '../../storage/blob-store';
import type { ExportsService } from './exports.service';

/** /api/studios/:studioId/exports: comparison sheets made as background jobs. Viewers download, editors ask, owners delete anyone's. */
export function exportsRoutes(exports: ExportsService, secret: string): ApiRouter {
  const api = new ApiRouter('/studios/:studioId/exports', 'Exports');
  const exportId = (req: Parameters<RequestHandler>[0]) => idParam(req, 'exportId', 'The export');
  const actor = (req: Parameters<RequestHandler>[0]) => req.membership!;

  api.route('get', '/', { policy: studioRole('viewer'), summary: "The studio's exports, newest first, with each job's progress" }, async (req, res) => {
    res.json({ exports: await exports.list(req.membership!.studioId) });
  });
  api.route('post', '/', { policy: studioRole('editor'), summary: 'Ask for a comparison sheet (artworks × looks, a layout, a scale); checked in full, then queued', body: sheetRequestSchema, status: 202 }, async (req, res) => {
    res.status(202).json({ export: await exports.create(actor(req), req.body) });
  });
  api.route('post', '/animations', { policy: studioRole('editor'), summary: 'Ask for an animated export (one animation through one look, as APNG and GIF with a flash check); checked in full, then queued', body: animationRequestSchema, status: 202 }, async (req, res) => {
    res.status(202).json({ export: await exports.createAnimation(actor(req), req.body) });
  });
  api.route('get', '/:exportId', { policy: studioRole('viewer'), summary: 'One export and its progress' }, async (req, res) => {
    res.json({ export: await exports.get(req.membership!.studioId, exportId(req)) });
  });
  api.route('get', '/:exportId/file', { policy: studioRole('viewer'), summary: 'Download a finished file: a sheet as ?format=png (the default), pdf or zip (single renders and a manifest), an animation as apng, gif or json (its manifest with the flash check). Answers 303 to a signed link that works for 15 minutes without a session; 409 until the export is ready' }, async (req, res) => {
    const raw = req.query.format ?? 'png';
    const format = EXPORT_FORMATS.find((f) => f === raw);
    if (!format) throw new AppError(400, 'invalid_input', `format must be one of ${EXPORT_FORMATS.join(', ')}, got “${String(raw).slice(0, 20)}”.`);
    const url = await exports.downloadUrl(req.membership!.studioId, exportId(req), format, (d) => `/api/downloads/${signDownload(secret, d)}`);
    res.set('Cache-Control', 'private, no-store').redirect(303, url);
  });
  api.route('post', '/:exportId/cancel', { policy: studioRole('editor'), summary: 'Stop a waiting or running export (your own, or anyone\'s as an owner); partial output is removed' }, async (req, res) => {
    res.json({ export: await exports.cancel(actor(req), exportId(req)) });
  });
  api.route('post', '/:exportId/retry', { policy: studioRole('editor'), summary: 'Queue a failed or cancelled export again' }, async (req, res) => {
    res.json({ export: await exports.retry(actor(req), exportId(req)) });
  });
  api.route('delete', '/:exportId', { policy: studioRole('editor'), summary: 'Delete an export and its file (your own, or anyone\'s as an owner)', status: 204 }, async (req, res) => {
    await exports.remove(actor(req), exportId(req));
    res.status(204).end();
  });
  return api;
}

/** /api/downloads/<token>: a file behind a link the app signed (exports on disk), no session needed until it expires. */
export function downloadRoutes(blobs: BlobStore, secret: string): ApiRouter {
  const api = new ApiRouter('/downloads', 'Exports');
  api.route('get', '/:token', { policy: publicAccess, summary: 'A file behind a signed, expiring download link (404 when the link is not valid, 410 once it has expired)' }, async (req, res) => {
    const d = verifyDownload(secret, String(req.params.token));
    const bytes = await blobs.get(d.key).catch(() => {
      throw new AppError(404, 'not_found', 'The file behind this link is gone: the export was deleted.');
    });
    res.set({ 'Content-Type': d.contentType, 'X-Content-Type-Options': 'nosniff', 'Content-Disposition': `attachment; filename="${d.fileName.replace(/[^\w .-]/g, '_')}"`, 'Cache-Control': 'private, no-store', 'Referrer-Policy': 'no-referrer' });
    res.send(bytes);
  });
  return api;
}
