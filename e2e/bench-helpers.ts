import { readFileSync } from 'node:fs';
import path from 'node:path';
import type { APIResponse, Page } from '@playwright/test';
import { expect } from './fixtures';

const modules = path.resolve(__dirname, '../node_modules');

/** The third-party test artworks (see e2e/fixtures/README.md), as PNG bytes. */
export async function thirdPartyArtworks(page: Page): Promise<{ name: string; bytes: Buffer }[]> {
  const icon = (name: string) =>
    readFileSync(path.join(modules, '@hackernoon/pixel-icon-library/icons/PNG/for-dark-mode/48px/solid', `${name}.png`));
  const svg = readFileSync(path.join(modules, 'pixelarticons/svg/gamepad.svg'), 'utf8').replace('currentColor', '#ffffff');
  const font = readFileSync(path.join(modules, '@fontsource/press-start-2p/files/press-start-2p-latin-400-normal.woff2')).toString(
    'base64',
  );
  const [gamepad, text] = await page.evaluate(
    async ({ svg, font }) => {
      const toPng = async (canvas: HTMLCanvasElement) => {
        const blob: Blob = await new Promise((r) => canvas.toBlob((b) => r(b!), 'image/png'));
        return Array.from(new Uint8Array(await blob.arrayBuffer()));
      };
      const a = document.createElement('canvas');
      a.width = a.height = 96;
      const img = new Image();
      img.src = URL.createObjectURL(new Blob([svg], { type: 'image/svg+xml' }));
      await img.decode();
      const ca = a.getContext('2d')!;
      ca.fillStyle = '#000';
      ca.fillRect(0, 0, 96, 96);
      ca.imageSmoothingEnabled = false;
      ca.drawImage(img, 0, 0, 96, 96);
      const face = new FontFace(
        'PressStartTest',
        Uint8Array.from(atob(font), (c) => c.charCodeAt(0)),
      );
      await face.load();
      document.fonts.add(face);
      const b = document.createElement('canvas');
      b.width = 256;
      b.height = 32;
      const cb = b.getContext('2d')!;
      cb.fillStyle = '#000';
      cb.fillRect(0, 0, 256, 32);
      cb.fillStyle = '#fff';
      cb.font = '16px PressStartTest';
      cb.textBaseline = 'top';
      cb.fillText('EMBERLINE 0123', 8, 8);
      return [await toPng(a), await toPng(b)];
    },
    { svg, font },
  );
  return [
    { name: 'heart', bytes: icon('heart') },
    { name: 'trophy', bytes: icon('trophy') },
    { name: 'gamepad', bytes: Buffer.from(gamepad) },
    { name: 'press-start-text', bytes: Buffer.from(text) },
  ];
}

/** Uploads an artwork through the API with the page's session and XSRF token. */
export async function uploadArtwork(page: Page, studioId: string, name: string, bytes: Buffer): Promise<string> {
  const cookies = await page.context().cookies();
  const xsrf = cookies.find((c) => c.name === 'XSRF-TOKEN')!.value;
  const res: APIResponse = await page.request.post(`/api/studios/${studioId}/artworks`, {
    headers: { 'X-XSRF-TOKEN': xsrf },
    multipart: { name, file: { name: `${name}.png`, mimeType: 'image/png', buffer: bytes } },
  });
  expect(res.status(), await res.text()).toBe(201);
  return (await res.json()).artwork.id;
}

/** The studio id from a /studios/:id/... URL. */
export const studioIdOf = (url: string) => url.match(/studios\/([0-9a-f-]{36})/)![1];

/** Waits until the live view has finished a draw after `before` draws. */
export async function waitForDraw(page: Page, before: number): Promise<number> {
  const stage = page.getByTestId('stage');
  await expect.poll(async () => Number(await stage.getAttribute('data-draws')), { timeout: 30_000 }).toBeGreaterThan(before);
  return Number(await stage.getAttribute('data-draws'));
}

export async function draws(page: Page): Promise<number> {
  return Number((await page.getByTestId('stage').getAttribute('data-draws')) ?? 0);
}

/** Picks an option of a Material select by the select's accessible name. */
export async function choose(page: Page, select: string, option: string | RegExp): Promise<void> {
  await page.getByRole('combobox', { name: select }).click();
  await page.getByRole('option', { name: option, exact: typeof option === 'string' }).click();
}

/** Runs the drift check and returns the share of differing pixels (0–1). */
export async function driftShare(page: Page): Promise<number> {
  return (await drift(page)).share;
}

/** A drift check's figures: the share of pixels differing at all, and the largest channel difference. */
export interface Drift {
  share: number;
  maxChannel: number;
}

/** Runs the drift check on the bench and reads its figures. */
export async function drift(page: Page): Promise<Drift> {
  await page.getByRole('button', { name: 'Drift check' }).click();
  const result = page.getByTestId('drift-result');
  await expect(result).toBeVisible({ timeout: 60_000 });
  const share = Number((await result.textContent())!.match(/([\d.]+) %/)![1]) / 100;
  return { share, maxChannel: Number(await page.getByTestId('drift-max').textContent()) };
}
