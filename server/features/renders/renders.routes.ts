import multer from 'multer';
import type { RequestHandler } from 'express';
import { renderFieldsSchema, type RenderDto } from '../../../shared/api/render.schema';
import { builtInPresetById } from '../../../shared/model/panel-types';
import { mergeParams, panelParamsPatchSchema, panelParamsSchema, type PanelParams, type PanelParamsPatch } from '../../../shared/model/parameters';
import { ApiRouter } from '../../core/api-router';
import { AppError, notFound } from '../../core/app-error';
import { signedIn } from '../../core/policy';
import { parseOrThrow } from '../../core/validate';
import { IMAGE_LIMITS } from '../../render/decode';
import { renderKey, renderReference, type RenderStore } from '../../render/reference-renderer';
import { Render } from './render.model';

/** Multer in memory with integer limits; a breach becomes a 413 with the limit named. */
const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: IMAGE_LIMITS.maxBytes, files: 1, fields: 8, fieldSize: 32 * 1024, parts: 10 } });
const singleFile: RequestHandler = (req, res, next) =>
  upload.single('file')(req, res, (err: unknown) => {
    if (!err) return next();
    if (err instanceof multer.MulterError) {
      const status = err.code === 'LIMIT_FILE_SIZE' ? 413 : 400;
      const message = err.code === 'LIMIT_FILE_SIZE' ? `The file is larger than ${IMAGE_LIMITS.maxBytes} bytes.` : `The upload was refused: ${err.message} (${err.field ?? 'form'}).`;
      return next(new AppError(status, err.code === 'LIMIT_FILE_SIZE' ? 'file_too_large' : 'bad_upload', message));
    }
    next(err);
  });

function parseJsonField(text: string, what: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    throw new AppError(400, 'invalid_input', `${what} is not valid JSON.`);
  }
}

/** Resolves the parameters of a render request: a built-in preset (plus patch) or inline parameters. */
export function resolveParameters(fields: { presetId?: string; parameters?: string; patch?: string }): PanelParams {
  if (fields.parameters) return parseOrThrow(panelParamsSchema, parseJsonField(fields.parameters, 'parameters'), 'parameters');
  const preset = builtInPresetById(fields.presetId!);
  if (!preset) throw new AppError(400, 'unknown_preset', `There is no built-in preset "${fields.presetId}". GET /api/panel-types lists them.`);
  const patch = fields.patch ? (parseOrThrow(panelParamsPatchSchema, parseJsonField(fields.patch, 'patch'), 'patch') as PanelParamsPatch) : {};
  return parseOrThrow(panelParamsSchema, mergeParams(preset.parameters, patch), 'parameters');
}

/** /api/renders: reference renders by the server's CPU pipeline, cached by content hash. */
export function rendersRoutes(store: RenderStore): ApiRouter {
  const api = new ApiRouter('/renders', 'Panel model');

  api.route('post', '/', { policy: signedIn, summary: 'Render an uploaded image (multipart field "file") with a preset or inline parameters', status: 201 }, singleFile, async (req, res) => {
    const fields = parseOrThrow(renderFieldsSchema, req.body ?? {}, 'render request');
    if (!req.file) throw new AppError(400, 'invalid_input', 'Attach the image as the multipart field "file".');
    const parameters = resolveParameters(fields);
    const request = { input: req.file.buffer, parameters, scale: fields.scale, frame: fields.frame };
    const key = renderKey(request);
    let row = await Render.findByPk(key);
    let cached = true;
    // A row whose file went missing is rendered again rather than served broken.
    if (!row || !(await store.exists(key))) {
      cached = false;
      const { png, width, height } = await renderReference(request);
      // File first, then the row: a crash between leaves an unreferenced file, never a row without one.
      await store.write(key, png);
      [row] = await Render.upsert({ key, width, height, bytes: png.length, createdById: req.user!.id });
    }
    const body: RenderDto = { key, url: `/api/renders/${key}`, width: row.width, height: row.height, cached };
    res.status(cached ? 200 : 201).json({ render: body });
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
