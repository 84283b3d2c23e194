import { mkdtempSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { createHarness, TestClient, type Harness } from '../testing/harness';

// Security item 14 (README): the page may run only its own scripts; styles need the per-response
// nonce Angular stamps on the <style> elements it inserts. API answers get a stricter policy
// (auth.spec.ts).
let h: Harness;
beforeAll(async () => {
  const staticDir = mkdtempSync(path.join(os.tmpdir(), 'emberline-page-'));
  writeFileSync(
    path.join(staticDir, 'index.html'),
    '<!doctype html><html><head><meta name="csp" content="__CSP_NONCE__"></head><body></body></html>',
  );
  h = await createHarness({ staticDir });
});
afterAll(() => h.close());

const directivesOf = (csp: string) =>
  new Map(
    csp
      .split(';')
      .map((d) => d.trim().split(/\s+/))
      .map(([name, ...values]) => [name, values]),
  );

test('the page: scripts from our origin only (and WebAssembly compiled, not eval), styles by a fresh nonce that the page carries', async () => {
  const client = new TestClient(h.app);
  const [first, second] = [await client.get('/studio/bench'), await client.get('/studio/bench')];
  expect(first.status).toBe(200);
  const directives = directivesOf(first.headers['content-security-policy']);
  expect(directives.get('script-src')).toEqual(["'self'", "'wasm-unsafe-eval'"]);
  expect(directives.get('object-src')).toEqual(["'none'"]);
  expect(directives.get('frame-ancestors')).toEqual(["'none'"]);
  const nonce = directives
    .get('style-src')!
    .find((v) => v.startsWith("'nonce-"))!
    .slice(7, -1);
  expect(nonce).toMatch(/^[A-Za-z0-9+/]{22}==$/);
  expect(first.text).toContain(`content="${nonce}"`);
  // A nonce used twice would be no nonce at all.
  expect(second.headers['content-security-policy']).not.toContain(nonce);
});
