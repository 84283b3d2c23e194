import type { RenderDto } from '../../../shared/api/render.schema';
import { builtInPresetById } from '../../../shared/model/panel-types';
import { mergeParams, panelParamsPatchSchema, panelParamsSchema, type PanelParams, type PanelParamsPatch } from '../../../shared/model/parameters';
import { AppError } from '../../core/app-error';
import { parseOrThrow } from '../../core/validate';
import { renderKey, renderReference, type RenderRequest, type RenderStore } from '../../render/reference-renderer';
import { Render } from './render.model';

function parseJsonField(text: string, what: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    throw new AppError(400, 'invalid_input', `${what} is not valid JSON.`);
  }
}

/** Resolves the parameters of a render request: a built-in preset (plus patch) or inline parameters. */
export function resolveParameters(fields: { presetId?: string; parameters?: unknown; patch?: unknown }): PanelParams {
  const json = (v: unknown, what: string) => (typeof v === 'string' ? parseJsonField(v, what) : v);
  if (fields.parameters !== undefined) return parseOrThrow(panelParamsSchema, json(fields.parameters, 'parameters'), 'parameters');
  const preset = builtInPresetById(fields.presetId!);
  if (!preset) throw new AppError(400, 'unknown_preset', `There is no built-in preset "${fields.presetId}". GET /api/panel-types lists them.`);
  const patch = fields.patch !== undefined ? (parseOrThrow(panelParamsPatchSchema, json(fields.patch, 'patch'), 'patch') as PanelParamsPatch) : {};
  return parseOrThrow(panelParamsSchema, mergeParams(preset.parameters, patch), 'parameters');
}

/** A reference render from the cache, or rendered now and stored (file first, then its row). */
export async function cachedRender(store: RenderStore, request: RenderRequest, userId: string): Promise<RenderDto> {
  const key = renderKey(request);
  let row = await Render.findByPk(key);
  let cached = true;
  // A row whose file went missing is rendered again rather than served broken.
  if (!row || !(await store.exists(key))) {
    cached = false;
    const { png, width, height } = await renderReference(request);
    // A crash between the two writes leaves an unreferenced file, never a row without one.
    await store.write(key, png);
    [row] = await Render.upsert({ key, width, height, bytes: png.length, createdById: userId });
  }
  return { key, url: `/api/renders/${key}`, width: row.width, height: row.height, cached };
}


/** Removes render files left without a row (a crash between file and row) and stray temp files. */
export function reconcileRenders(store: RenderStore): Promise<number> {
  return store.reconcile(async (keys) => new Set(keys.length ? (await Render.findAll({ attributes: ['key'], where: { key: keys } })).map((r) => r.key) : []));
}
