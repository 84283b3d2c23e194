import sharp from 'sharp';
import { choose, studioIdOf, uploadArtwork, waitForDraw } from './bench-helpers';
import { expect, signIn, test } from './fixtures';

/** A 64 × 48 GIF that flashes the whole picture white and black, `flashes` times a second (GIF delays are whole hundredths). */
async function flashingGif(delayMs: number): Promise<Buffer> {
  const w = 64;
  const h = 48;
  const raw = Buffer.alloc(w * h * 4 * 4);
  for (let k = 0; k < 4; k++) raw.fill(k % 2 === 0 ? 255 : 0, k * w * h * 4, (k + 1) * w * h * 4);
  return sharp(raw, { raw: { width: w, height: h * 4, channels: 4, pageHeight: h } })
    .gif({ delay: [delayMs, delayMs, delayMs, delayMs], loop: 0 })
    .toBuffer();
}

test('the bench checks flashes on the emitted light at the viewing distance, gates playback, and shows what the eye resolves', async ({
  page,
  guard,
}, testInfo) => {
  void guard;
  await signIn(page, 'editor@kilnquartz.example', 'amber-glow-demo');
  await expect(page).toHaveURL(/\/bench/);
  await waitForDraw(page, 0);
  const name = `Strobe ${Date.now().toString(36)}`;
  await uploadArtwork(page, studioIdOf(page.url()), name, await flashingGif(60));
  await page.reload();
  await choose(page, 'Artwork', name);
  // 60 ms frames: 16.7 transitions a second, 8 flashes (pairs) [std WCAG 2.2 SC 2.3.1: more than three fails].
  const warning = page.getByTestId('flash-warning');
  await expect(warning).toContainText('flashes up to 8 times a second', { timeout: 30_000 });
  await expect(warning).toContainText('seen from 600 mm');
  await expect(page.getByRole('button', { name: 'Play', exact: true })).toBeDisabled();
  await page.screenshot({ path: testInfo.outputPath('flash-warning.png') });
  // From 20 m the 192 × 144 mm panel covers 7e-5 sr, under 0.006 sr: the same flashes no longer fail [calc].
  const distance = page.getByRole('spinbutton', { name: 'Viewing distance (mm)' });
  await distance.fill('20000');
  await distance.press('Tab');
  await expect(page.getByTestId('flash-ok')).toContainText('at most 8 flashes a second in one place at 20000 mm', { timeout: 30_000 });
  await expect(page.getByRole('button', { name: 'Play', exact: true })).toBeEnabled();
  // Acuity at 600 mm for a 0.30 mm pitch: 1.72′ a cell, blending beyond 1.03 m [calc from ISO 8596 1′].
  await distance.fill('600');
  await distance.press('Tab');
  await expect(page.getByTestId('acuity')).toContainText('1.72′ a cell · cells visible at 20/20 (they blend beyond 1.03 m)');
});

test('the analysis panel: legibility, acuity, light, burn-in, a chart of an animation, a JSON download, and a test pattern for the panel', async ({
  page,
  guard,
}, testInfo) => {
  void guard;
  await signIn(page, 'editor@kilnquartz.example', 'amber-glow-demo');
  await expect(page).toHaveURL(/\/bench/);
  await waitForDraw(page, 0);
  await page.getByRole('button', { name: 'Analysis' }).click();
  const panel = page.locator('#bench-analysis');
  // The test pattern opens on the bench at the panel's own size; its one-cell line pairs are what legibility measures.
  await panel.getByRole('button', { name: 'Add a test pattern' }).click();
  await expect(page.getByRole('combobox', { name: 'Artwork' })).toContainText('Test pattern 640×480', { timeout: 30_000 });
  await expect(panel.getByTestId('legibility-score')).toContainText('% of one-cell contrast kept', { timeout: 30_000 });
  await expect(panel).toContainText('1.72′ a cell');
  await expect(panel.getByRole('spinbutton', { name: 'Hours shown' })).toHaveValue('1000');
  await expect(panel.getByRole('img', { name: /where one-cell detail is lost/ })).toBeVisible();
  const [download] = await Promise.all([page.waitForEvent('download'), panel.getByRole('button', { name: 'JSON' }).click()]);
  const doc = JSON.parse(Buffer.concat(await (await download.createReadStream()).toArray()).toString('utf8'));
  expect(doc).toMatchObject({ format: 'emberline.analysis', version: 1, distanceMm: 600, acuity: { resolvable: true } });
  expect(doc.legibility.score).toBeGreaterThan(0);
  expect(doc.light[0].meanCdM2).toBeGreaterThan(0);
  // An animation gets the per-frame chart.
  const name = `Pulse ${Date.now().toString(36)}`;
  await uploadArtwork(page, studioIdOf(page.url()), name, await flashingGif(250));
  await page.reload();
  await choose(page, 'Artwork', name);
  await page.getByRole('button', { name: 'Analysis' }).click();
  await expect(page.getByRole('img', { name: /Mean luminance per frame from/ })).toBeVisible({ timeout: 30_000 });
  await page.locator('#bench-analysis').scrollIntoViewIfNeeded();
  await page.screenshot({ path: testInfo.outputPath('analysis.png') });
});
