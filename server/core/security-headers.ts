import type { RequestHandler } from 'express';
import helmet from 'helmet';
import { randomBytes } from 'node:crypto';

const helmetWithCsp = helmet({
  contentSecurityPolicy: {
    useDefaults: false,
    directives: {
      defaultSrc: ["'self'"],
      // 'wasm-unsafe-eval' lets the bench's worker compile the glow blur's WebAssembly kernels;
      // it allows no eval() of script text.
      scriptSrc: ["'self'", "'wasm-unsafe-eval'"],
      // Angular inserts component styles as <style> elements carrying the ngCspNonce value.
      styleSrc: ["'self'", (_req, res) => `'nonce-${(res as unknown as { locals: { cspNonce: string } }).locals.cspNonce}'`],
      imgSrc: ["'self'", 'data:', 'blob:'],
      fontSrc: ["'self'"],
      connectSrc: ["'self'"],
      workerSrc: ["'self'", 'blob:'],
      objectSrc: ["'none'"],
      baseUri: ["'self'"],
      formAction: ["'self'"],
      frameAncestors: ["'none'"],
    },
  },
  crossOriginEmbedderPolicy: false,
  referrerPolicy: { policy: 'same-origin' },
});

/**
 * API answers are data, never a page: nothing may run or load from them (a PNG opened in its own
 * tab may still show itself). This is the stricter policy, and it needs no nonce.
 */
const helmetForApi = helmet({
  contentSecurityPolicy: {
    useDefaults: false,
    directives: { defaultSrc: ["'none'"], imgSrc: ["'self'"], frameAncestors: ["'none'"], baseUri: ["'none'"], formAction: ["'none'"] },
  },
  crossOriginEmbedderPolicy: false,
  referrerPolicy: { policy: 'same-origin' },
});

/** helmet's headers with a strict CSP (ASVS 5.0 3.4): a fresh nonce for pages, none at all for API answers. */
export const securityHeaders: RequestHandler = (req, res, next) => {
  if (req.path.startsWith('/api/')) return helmetForApi(req, res, next);
  res.locals.cspNonce = randomBytes(16).toString('base64');
  helmetWithCsp(req, res, next);
};
