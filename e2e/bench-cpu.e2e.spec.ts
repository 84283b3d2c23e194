import { choose, driftShare, studioIdOf, thirdPartyArtworks, uploadArtwork, waitForDraw } from './bench-helpers';
import { CHROMIUM } from './chromium';
import { expect, signIn, test } from './fixtures';

// The same browser without WebGL: the bench must draw the same picture from the CPU pipeline.
test.use({
  launchOptions: { ...CHROMIUM, args: [...CHROMIUM.args, '--disable-webgl', '--disable-webgl2'] },
});

test('without WebGL the CPU fallback draws the reference picture, with a notice', async ({ page, guard }, testInfo) => {
  void guard;
  await signIn(page, 'editor@kilnquartz.example', 'amber-glow-demo');
  await expect(page).toHaveURL(/\/bench/);
  const studioId = studioIdOf(page.url());
  const [, trophy] = await thirdPartyArtworks(page);
  const id = await uploadArtwork(page, studioId, `cpu-trophy-${Date.now().toString(36)}`, trophy.bytes);
  await page.goto(`/studios/${studioId}/bench?artwork=${id}`);
  await waitForDraw(page, 0);
  await expect(page.getByText('WebGL2 is not available here')).toBeVisible();
  await expect(page.getByTestId('cpu-canvas')).toBeVisible();
  // The worker's glow and composer run as WebAssembly kernels: the page's policy lets it compile
  // them (an empty module here), and the picture still equals the server's to the byte.
  const compiles = await page.evaluate(() =>
    WebAssembly.compile(new Uint8Array([0, 97, 115, 109, 1, 0, 0, 0])).then(
      () => 'compiles',
      (err: Error) => err.message,
    ),
  );
  expect(compiles).toBe('compiles');
  expect(await driftShare(page)).toBe(0);
  await choose(page, 'Panel type', 'Monochrome CRT, green (P1-like)');
  await waitForDraw(page, 1);
  expect(await driftShare(page)).toBe(0);
  await page.screenshot({ path: testInfo.outputPath('bench-cpu.png') });
});
