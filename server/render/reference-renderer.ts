import { createHash, randomBytes } from 'node:crypto';
import { access, mkdir, readdir, readFile, rename, rm, writeFile } from 'node:fs/promises';
import path from 'node:path';
import type { PanelParams } from '../../shared/model/parameters';
import { outputUniforms } from '../../shared/pipeline/output/uniforms';
import { PIPELINE_VERSION, renderCpu } from '../../shared/pipeline/render';
import { AppError } from '../core/app-error';
import type { SpriteSheet } from '../../shared/pipeline/sprite-sheet';
import { decodeImage, framesOf } from './decode';
import { encodePng } from './encode';

/** Largest output image a reference render may produce. */
export const MAX_OUTPUT_PIXELS = 24_000_000;

/** What a reference render is asked for. */
export interface RenderRequest {
  input: Buffer;
  /** When the input is a sprite sheet: how to cut it into frames. */
  sheet?: SpriteSheet | null;
  parameters: PanelParams;
  scale: number;
  frame: number;
}

/** Cache key: SHA-256 over the input bytes, the parameters (canonical JSON), scale, frame and pipeline version. */
export function renderKey(req: RenderRequest): string {
  const h = createHash('sha256');
  h.update(`emberline-render/${PIPELINE_VERSION}\n`);
  h.update(createHash('sha256').update(req.input).digest());
  h.update(JSON.stringify(canonical(req.parameters)));
  h.update(`\n${req.scale}\n${req.frame}\n${JSON.stringify(req.sheet ?? null)}`);
  return h.digest('hex');
}

function canonical(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(canonical);
  if (value && typeof value === 'object') return Object.fromEntries(Object.keys(value).sort().map((k) => [k, canonical((value as Record<string, unknown>)[k])]));
  return value;
}

/** Decodes, checks the output size, runs the CPU pipeline and encodes a PNG. */
export async function renderReference(req: RenderRequest): Promise<{ png: Buffer; width: number; height: number }> {
  const u = outputUniforms(req.parameters, req.scale);
  if (u.cellH < 1) throw new AppError(400, 'invalid_input', `scale ${req.scale} makes cells ${u.cellH.toFixed(2)} px tall; use a scale of at least ${Math.ceil(req.parameters.cell.pitchXMm / req.parameters.cell.pitchYMm)}.`);
  if (u.width * u.height > MAX_OUTPUT_PIXELS) {
    throw new AppError(400, 'output_too_large', `The render would be ${u.width} × ${u.height} pixels; the limit is ${MAX_OUTPUT_PIXELS}. Lower the scale.`);
  }
  const frames = framesOf(await decodeImage(req.input), req.sheet);
  if (req.frame >= frames.length) throw new AppError(400, 'invalid_input', `frame must be from 0 to ${frames.length - 1} for this image, got ${req.frame}.`);
  const image = renderCpu(frames, req.parameters, { scale: req.scale, frame: req.frame });
  return { png: await encodePng(image), width: image.width, height: image.height };
}

/** Render PNGs on disk, named by cache key, outside the web root; written atomically. */
export class RenderStore {
  constructor(private readonly dir: string) {}

  fileOf(key: string): string {
    if (!/^[0-9a-f]{64}$/.test(key)) throw new AppError(404, 'not_found', 'The render was not found.');
    return path.join(this.dir, 'renders', `${key}.png`);
  }

  async write(key: string, png: Buffer): Promise<void> {
    const file = this.fileOf(key);
    await mkdir(path.dirname(file), { recursive: true });
    // A random suffix: two writers of one key in the same millisecond must not share a temp file.
    const tmp = `${file}.${randomBytes(8).toString('hex')}.tmp`;
    await writeFile(tmp, png);
    await rename(tmp, file);
  }

  /** Removes temp files and render files whose key `isKnown` does not list (after a crash); returns how many. */
  async reconcile(isKnown: (keys: string[]) => Promise<Set<string>>): Promise<number> {
    const dir = path.join(this.dir, 'renders');
    const names = await readdir(dir).catch(() => [] as string[]);
    const keys = names.filter((n) => /^[0-9a-f]{64}\.png$/.test(n)).map((n) => n.slice(0, 64));
    const known = await isKnown(keys);
    const stale = names.filter((n) => n.endsWith('.tmp') || (/^[0-9a-f]{64}\.png$/.test(n) && !known.has(n.slice(0, 64))));
    for (const n of stale) await rm(path.join(dir, n), { force: true });
    return stale.length;
  }

  async exists(key: string): Promise<boolean> {
    return access(this.fileOf(key)).then(
      () => true,
      () => false,
    );
  }

  read(key: string): Promise<Buffer> {
    return readFile(this.fileOf(key));
  }
}
