import { PNG } from 'pngjs';
import type { Download, Page } from '@playwright/test';
import { choose, studioIdOf, uploadArtwork, waitForDraw } from './bench-helpers';
import { expect, signIn, test } from './fixtures';

/** A 640 × 480 card, left half white and right half black: its packed rows are known by hand. */
function halfCard(): Buffer {
  const png = new PNG({ width: 640, height: 480 });
  for (let i = 0; i < 640 * 480; i++) {
    png.data.fill(i % 640 < 320 ? 255 : 0, i * 4, i * 4 + 3);
    png.data[i * 4 + 3] = 255;
  }
  return PNG.sync.write(png);
}

async function bytesOf(download: Download): Promise<Buffer> {
  return Buffer.concat(await (await download.createReadStream()).toArray());
}

async function downloadWith(page: Page, button: string | RegExp): Promise<{ name: string; bytes: Buffer }> {
  const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: button }).click()]);
  return { name: download.suggestedFilename(), bytes: await bytesOf(download) };
}

const fill = (n: number, v: number) => [...new Array(n).fill(v)];

test('frame data from the drive timing page and the bench: the downloads hold exactly the cells, in the layout chosen', async ({
  page,
  guard,
}, testInfo) => {
  void guard;
  await signIn(page, 'editor@kilnquartz.example', 'amber-glow-demo');
  await expect(page).toHaveURL(/\/bench/);
  const name = `Half card ${Date.now().toString(36)}`;
  await uploadArtwork(page, studioIdOf(page.url()), name, halfCard());

  // Drive timing page: the default timing is dual-scan at 4 pixels a shift clock.
  await page.getByRole('link', { name: 'Drive timing' }).click();
  await choose(page, 'Artwork', name);
  await choose(page, 'Look', 'Line art, no dither');
  await expect(page.getByRole('combobox', { name: 'Scan' })).toContainText('Dual scan, interleaved');
  await expect(page.getByRole('combobox', { name: 'Pixels per shift clock' }).last()).toContainText('4');
  await expect(page.getByTestId('frame-data-size')).toContainText('640 × 480 cells · 38,400 bytes a frame');
  await expect(page.getByRole('img', { name: /Layout diagram/ })).toBeVisible();
  await choose(page, 'Format', 'Raw binary (.bin)');
  const dual = await downloadWith(page, 'Download Raw binary');
  expect(dual.name).toMatch(/\.bin$/);
  // [calc] cols·rows·bits/8 = 640·480/8. Interleaved at 4 a clock, a line carries 4 upper then 4
  // lower cells a byte: both halves are white left of 320, so a line is 80 bytes FF then 80 of 00.
  expect(dual.bytes.length).toBe(38400);
  expect([...dual.bytes.subarray(160 * 7, 160 * 8)]).toEqual([...fill(80, 0xff), ...fill(80, 0)]);

  // Four levels need 2 bits; 1 bit is refused with what to do; frame-rate control makes 3 frames.
  await choose(page, 'Look', 'Ordered dither, 4 levels');
  await expect(page.getByTestId('frame-data-size')).toContainText('76,800 bytes a frame');
  await page.getByRole('radio', { name: '1 bit' }).click();
  await expect(page.getByRole('alert').filter({ hasText: 'This layout cannot hold the panel' })).toContainText(
    '4 gray levels but 1 bit a cell holds 2',
  );
  await expect(page.getByRole('button', { name: /^Download/ })).toBeDisabled();
  await choose(page, 'Gray by frame-rate control', '4 levels over 3 frames');
  await expect(page.getByTestId('frame-data-size')).toContainText('3 frames · 115,200 bytes in all');
  await choose(page, 'Format', 'C header (.h)');
  const header = await downloadWith(page, 'Download C header');
  const text = header.bytes.toString('utf8');
  const array = /static const uint8_t (\w+)\[(\d+)\] = \{([^}]*)\}/.exec(text)!;
  expect(Number(array[2])).toBe(115200);
  expect(array[3].split(',').filter((s) => s.trim()).length).toBe(115200);
  await page.getByRole('heading', { name: 'Frame data' }).scrollIntoViewIfNeeded();
  await page.screenshot({ path: testInfo.outputPath('drive-frame-data.png') });

  // Bench: no timing chosen, so single scan at 1 cell a clock; a row is 40 bytes FF then 40 of 00.
  await page.getByRole('link', { name: 'Bench' }).click();
  await choose(page, 'Artwork', name);
  await choose(page, 'Preset', 'Line art, no dither');
  await waitForDraw(page, 0);
  await page.getByRole('button', { name: 'Frame data' }).click();
  await expect(page.getByRole('combobox', { name: 'Scan' })).toContainText('Single scan');
  await choose(page, 'Format', 'Raw binary (.bin)');
  const single = await downloadWith(page, 'Download Raw binary');
  expect(single.bytes.length).toBe(38400);
  expect([...single.bytes.subarray(80 * 100, 80 * 101)]).toEqual([...fill(40, 0xff), ...fill(40, 0)]);
  // LSB first changes nothing in bytes of one colour; a dual-scan plane layout puts the lower half after the upper.
  await choose(page, 'Scan', 'Dual scan, two planes');
  await expect(page.getByRole('listitem').filter({ hasText: 'Dual scan as two planes' })).toContainText('rows 240–479');
  await page.screenshot({ path: testInfo.outputPath('bench-frame-data.png'), fullPage: true });
});

test('on a phone the frame data controls stack and the diagram scrolls sideways', async ({ page, guard }, testInfo) => {
  void guard;
  await page.setViewportSize({ width: 390, height: 844 });
  await signIn(page, 'editor@kilnquartz.example', 'amber-glow-demo');
  await expect(page).toHaveURL(/\/bench/);
  await page.goto(page.url().replace(/\/bench.*$/, '/drive'));
  const region = page.getByRole('region', { name: /Layout diagram/ });
  await expect(region).toBeVisible();
  // The page itself never scrolls sideways; the diagram does.
  expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
  expect(await region.evaluate((el) => el.scrollWidth > el.clientWidth)).toBe(true);
  await region.scrollIntoViewIfNeeded();
  await page.screenshot({ path: testInfo.outputPath('drive-frame-data-phone.png') });
  await page.getByRole('heading', { name: 'Frame data' }).scrollIntoViewIfNeeded();
  await page.screenshot({ path: testInfo.outputPath('drive-frame-data-phone-controls.png') });
});
