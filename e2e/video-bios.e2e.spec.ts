import type { Page } from '@playwright/test';
import { syntheticRom } from '@shared/drive/sample-rom';
import { readRom } from '@shared/drive/vga-rom';
import { choose, studioIdOf } from './bench-helpers';
import { expect, signIn, test } from './fixtures';

/** Saves a drive timing through the API with the page's session and XSRF token. */
async function saveTiming(page: Page, studioId: string, name: string, mode: string): Promise<void> {
  const xsrf = (await page.context().cookies()).find((c) => c.name === 'XSRF-TOKEN')!.value;
  const res = await page.request.post(`/api/studios/${studioId}/timings`, {
    headers: { 'X-XSRF-TOKEN': xsrf },
    data: {
      name,
      panelTypeId: 'el-amber-640x480',
      source: { kind: 'standard', standard: 'dmt', mode },
      interface: { dualScan: true, pixelsPerClock: 4 },
    },
  });
  expect(res.status(), await res.text()).toBe(201);
}

test('an editor reads a ROM image, patches mode 12h with a saved timing after seeing the byte diff, and downloads the patched image', async ({
  page,
  guard,
}, testInfo) => {
  void guard;
  await signIn(page, 'editor@kilnquartz.example', 'amber-glow-demo');
  await expect(page).toHaveURL(/\/bench/);
  const studioId = studioIdOf(page.url());
  const timingName = `IBM 640x400 ${Date.now().toString(36)}`;
  await saveTiming(page, studioId, timingName, '640x400@70');
  await page.getByRole('link', { name: 'Video BIOS' }).click();
  await expect(page.getByRole('heading', { name: 'Before you flash' })).toBeVisible();

  const cardName = `Card ${Date.now().toString(36)}`;
  await page
    .locator('input[type=file]')
    .setInputFiles({ name: `${cardName}.rom`, mimeType: 'application/octet-stream', buffer: Buffer.from(syntheticRom()) });
  await expect(page.getByRole('heading', { name: cardName, exact: true })).toBeVisible();
  await expect(page.getByTestId('rom-checksum')).toHaveText('Good: the bytes sum to 00');
  await expect(page.getByText('at 0x1000, from the video save pointer table at 0x0800')).toBeVisible();
  // Mode 12h: 640×480 at 25.175 MHz, 59.94 Hz [ds; calc 25.175 MHz / (800 · 525)].
  const table = page.getByRole('region', { name: 'Parameter table entries' });
  await expect(table.getByRole('row', { name: /1Bh/ })).toContainText('640×480 graphics, 8-dot, 25.175 MHz, 59.94 Hz');
  await expect(table.getByRole('row', { name: /18h/ })).toContainText('720×400 text, 9-dot, 28.322 MHz, 70.09 Hz');
  await expect(table.getByRole('row')).toHaveCount(3);
  await page.getByRole('switch', { name: /Show the 27 empty entries/ }).click();
  await expect(table.getByRole('row')).toHaveCount(30);

  await choose(page, 'Drive timing', new RegExp(timingName));
  const diff = page.getByRole('region', { name: 'Byte diff' });
  await expect(page.getByRole('heading', { name: 'Byte diff: 13 bytes change' })).toBeVisible();
  await expect(diff.getByRole('row', { name: /CR06 Vertical total/ })).toContainText('0x16D0');
  await expect(diff.getByRole('row', { name: /CR06 Vertical total/ })).toContainText('BF');
  await page.screenshot({ path: testInfo.outputPath('bios-diff.png'), fullPage: true });
  await page.getByRole('button', { name: 'Save patched image' }).click();
  const patchedName = `${cardName} · ${timingName}`;
  await expect(page.getByRole('heading', { name: patchedName })).toBeVisible();
  await expect(page.getByText(/entry 1Bh \(at 0x16C0\) now holds/)).toBeVisible();
  await expect(page.getByRole('list', { name: 'ROM images' })).toContainText(cardName);

  const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Download image' }).click()]);
  const bytes = Buffer.concat(await (await download.createReadStream()).toArray());
  expect(bytes.length).toBe(32768);
  expect(bytes.reduce((s, v) => (s + v) & 0xff, 0)).toBe(0);
  expect(readRom(bytes).entries[0x1b].decoded).toMatchObject({ width: 640, height: 400, vTotal: 449 });

  // The original again: refused, and led to the patched image; patching that asks first.
  await page.getByRole('button', { name: `Open ${cardName}`, exact: true }).click();
  await expect(page.getByRole('heading', { name: cardName, exact: true })).toBeVisible();
  await page.getByRole('button', { name: 'Save patched image' }).click();
  await page.getByRole('alertdialog').getByRole('button', { name: 'Open the patched image' }).click();
  await expect(page.getByRole('heading', { name: patchedName })).toBeVisible();
  await page.getByRole('button', { name: 'Save patched image' }).click();
  await expect(page.getByRole('alertdialog')).toContainText('It is already a patched image');
  await page.getByRole('alertdialog').getByRole('button', { name: 'Start from the patched image' }).click();
  await expect(page.getByRole('heading', { name: `${patchedName} · ${timingName}`.slice(0, 120) })).toBeVisible();
});

test('a file that is not an option ROM is refused with the reason; a viewer sees why the page is closed', async ({ page, browser }) => {
  await signIn(page, 'editor@kilnquartz.example', 'amber-glow-demo');
  await page.getByRole('link', { name: 'Video BIOS' }).click();
  await page
    .locator('input[type=file]')
    .setInputFiles({ name: 'notes.txt', mimeType: 'text/plain', buffer: Buffer.from('MZ not a rom at all') });
  await expect(page.getByRole('alert').filter({ hasText: 'was not added' })).toContainText('it starts with 4D 5A, not 55 AA');

  const context = await browser.newContext();
  const viewer = await context.newPage();
  await signIn(viewer, 'viewer@kilnquartz.example', 'amber-glow-demo');
  await viewer.getByRole('link', { name: 'Video BIOS' }).click();
  await expect(viewer.getByRole('heading', { name: 'For editors and owners' })).toBeVisible();
  await expect(viewer.getByRole('button', { name: 'Choose a file' })).toHaveCount(0);
  await context.close();
});

test('on a phone the Video BIOS page stacks and nothing scrolls sideways', async ({ page }, testInfo) => {
  await page.setViewportSize({ width: 390, height: 844 });
  await signIn(page, 'editor@kilnquartz.example', 'amber-glow-demo');
  await expect(page).toHaveURL(/\/bench/);
  await page.goto(page.url().replace(/\/bench.*$/, '/bios'));
  await expect(page.getByRole('heading', { name: 'Video BIOS', level: 1 })).toBeVisible();
  await page
    .locator('input[type=file]')
    .setInputFiles({ name: 'phone card.rom', mimeType: 'application/octet-stream', buffer: Buffer.from(syntheticRom()) });
  await expect(page.getByRole('heading', { name: 'phone card', exact: true })).toBeVisible();
  expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
  await page.getByRole('heading', { name: 'Patch an entry' }).scrollIntoViewIfNeeded();
  await page.screenshot({ path: testInfo.outputPath('bios-phone.png') });
});
