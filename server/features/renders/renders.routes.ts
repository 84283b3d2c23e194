import { renderFieldsSchema } from '@shared/api/render.schema';
import { ApiRouter } from '../../core/api-router';
import { signedIn } from '../../core/policy';
import { resolveParameters, type RendersService } from './renders.service';

/** /api/renders: reference renders by the server's CPU pipeline, cached by content hash. */
export function rendersRoutes(renders: RendersService): ApiRouter {
  const api = new ApiRouter('/renders', 'Panel model');

  api.route(
    'post',
    '/',
    {
      policy: signedIn,
      summary: 'Render an uploaded image (multipart field "file") with a preset or inline parameters',
      upload: { fields: renderFieldsSchema, file: 'the image' },
      status: 201,
    },
    async (req, res) => {
      const fields = req.body;
      const parameters = resolveParameters(fields);
      const render = await renders.render(
        { userId: req.user.id },
        { input: req.file.buffer, parameters, scale: fields.scale, frame: fields.frame },
      );
      res.status(render.cached ? 200 : 201).json({ render });
    },
  );

  api.route(
    'get',
    '/:key',
    { policy: signedIn, summary: 'A stored render of a file you uploaded, as PNG (studio renders are under their studio)' },
    async (req, res) => {
      const key = String(req.params.key);
      const png = await renders.read(key, { userId: req.user.id });
      res.set({
        'Content-Type': 'image/png',
        'Content-Disposition': `inline; filename="render-${key.slice(0, 12)}.png"`,
        'Cache-Control': 'private, max-age=31536000, immutable',
        'X-Content-Type-Options': 'nosniff',
      });
      res.send(png);
    },
  );

  return api;
}
