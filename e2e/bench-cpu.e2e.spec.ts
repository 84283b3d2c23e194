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
  expect(await driftShare(page)).toBe(0);
  await choose(page, 'Panel type', 'Monochrome CRT, green (P1-like)');
  await waitForDraw(page, 1);
  expect(await driftShare(page)).toBe(0);
  await page.screenshot({ path: testInfo.outputPath('bench-cpu.png') });
});
