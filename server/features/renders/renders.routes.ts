import { renderFieldsSchema } from '../../../shared/api/render.schema';
import { ApiRouter } from '../../core/api-router';
import { AppError, notFound } from '../../core/app-error';
import { signedIn } from '../../core/policy';
import { uploadOne } from '../../core/upload';
import { parseOrThrow } from '../../core/validate';
import type { RenderStore } from '../../render/reference-renderer';
import { cachedRender, resolveParameters } from './renders.service';
import { Render } from './render.model';

/** /api/renders: reference renders by the server's CPU pipeline, cached by content hash. */
export function rendersRoutes(store: RenderStore): ApiRouter {
  const api = new ApiRouter('/renders', 'Panel model');

  api.route('post', '/', { policy: signedIn, summary: 'Render an uploaded image (multipart field "file") with a preset or inline parameters', status: 201 }, uploadOne, async (req, res) => {
    const fields = parseOrThrow(renderFieldsSchema, req.body ?? {}, 'render request');
    if (!req.file) throw new AppError(400, 'invalid_input', 'Attach the image as the multipart field "file".');
    const parameters = resolveParameters(fields);
    const render = await cachedRender(store, { input: req.file.buffer, parameters, scale: fields.scale, frame: fields.frame }, req.user!.id);
    res.status(render.cached ? 200 : 201).json({ render });
  });

  api.route('get', '/:key', { policy: signedIn, summary: 'A stored reference render as PNG' }, async (req, res) => {
    const key = String(req.params.key);
    const row = /^[0-9a-f]{64}$/.test(key) ? await Render.findByPk(key) : null;
    if (!row) throw notFound('The render');
    const png = await store.read(key).catch(() => {
      throw notFound('The render file');
    });
    res.set({ 'Content-Type': 'image/png', 'Content-Disposition': `inline; filename="render-${key.slice(0, 12)}.png"`, 'Cache-Control': 'private, max-age=31536000, immutable', 'X-Content-Type-Options': 'nosniff' });
    res.send(png);
  });

  return api;
}
