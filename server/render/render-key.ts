import { createHash } from 'node:crypto';
import { PIPELINE_VERSION } from '@shared/pipeline/render';
import type { RenderRequest } from './render-engine';

/**
 * Cache key: SHA-256 over the owner scope (studio or user), the input bytes, the parameters
 * (canonical JSON), scale, frame, sheet and pipeline version. The scope keeps one studio's render
 * row apart from another's even for the same file.
 */
export function renderKey(req: RenderRequest, scope = ''): string {
  const h = createHash('sha256');
  h.update(`emberline-render/${PIPELINE_VERSION}\n${scope}\n`);
  h.update(createHash('sha256').update(req.input).digest());
  h.update(JSON.stringify(canonical(req.parameters)));
  h.update(`\n${req.scale}\n${req.frame}\n${JSON.stringify(req.sheet ?? null)}`);
  return h.digest('hex');
}

function canonical(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(canonical);
  if (value && typeof value === 'object')
    return Object.fromEntries(
      Object.keys(value)
        .sort()
        .map((k) => [k, canonical((value as Record<string, unknown>)[k])]),
    );
  return value;
}
