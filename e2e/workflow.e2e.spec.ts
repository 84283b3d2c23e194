import AxeBuilder from '@axe-core/playwright';
import type { Page } from '@playwright/test';
import { PANEL_TYPES } from '@shared/model/panel-types';
import { choose, studioIdOf, uploadArtwork, waitForDraw } from './bench-helpers';
import { expect, signIn, test } from './fixtures';
import { pngOf } from '../server/testing/images';

/** Issue "Workflow": the items left after the first rounds, each shown in the browser. */

async function openBench(page: Page, who = 'editor'): Promise<string> {
  await signIn(page, `${who}@kilnquartz.example`, 'amber-glow-demo');
  await expect(page).toHaveURL(/\/bench/);
  await waitForDraw(page, 0);
  return studioIdOf(page.url());
}

async function api(page: Page, method: 'post' | 'get', url: string, data?: object) {
  const xsrf = (await page.context().cookies()).find((c) => c.name === 'XSRF-TOKEN')?.value ?? '';
  return page.request[method](url, { headers: { 'X-XSRF-TOKEN': xsrf }, data });
}

test('item 2: on a slowed-down machine, two fields typed right after a panel-type switch both stick — box, slider, marker and what is saved', async ({
  page,
  guard,
}) => {
  void guard;
  test.setTimeout(180_000);
  const studioId = await openBench(page);
  const cdp = await page.context().newCDPSession(page);
  await cdp.send('Emulation.setCPUThrottlingRate', { rate: 8 });
  await choose(page, 'Panel type', PANEL_TYPES[1].name);
  const radius = page.getByRole('spinbutton', { name: 'Glow radius' });
  const share = page.getByRole('spinbutton', { name: 'Glow share' });
  await radius.fill('1.1');
  await radius.press('Tab');
  await share.fill('0.3');
  await share.press('Tab');
  await cdp.send('Emulation.setCPUThrottlingRate', { rate: 1 });
  await expect(radius).toHaveValue('1.1');
  await expect(share).toHaveValue('0.3');
  await expect(page.getByRole('slider', { name: 'Glow radius (mm)' })).toHaveValue('1.1');
  await expect(page.getByRole('slider', { name: 'Glow share' })).toHaveValue('0.3');
  await expect(page.getByRole('status').filter({ hasText: 'Modified since the built-in preset (2 changes)' })).toBeVisible();
  const name = `Typed values ${Date.now().toString(36)}`;
  await page.getByRole('textbox', { name: 'New preset name' }).fill(name);
  await page.getByRole('button', { name: 'Save as new' }).click();
  await expect(page.getByRole('combobox', { name: 'Preset' })).toContainText(name);
  const saved = (await (await api(page, 'get', `/api/studios/${studioId}/presets?q=${encodeURIComponent(name)}`)).json()).presets[0];
  expect(saved.parameters.glass).toMatchObject({ glowRadiusMm: 1.1, glowShare: 0.3 });
});

test('item 9: deleting an artwork names the live share links that show it, and where they go', async ({ page, guard }) => {
  void guard;
  // Share links are the owner's to make.
  const studioId = await openBench(page, 'owner');
  const name = `Linked art ${Date.now().toString(36)}`;
  const artworkId = await uploadArtwork(
    page,
    studioId,
    name,
    pngOf(8, 8, () => [255, 160, 0, 255]),
  );
  const preset = (
    await (
      await api(page, 'post', `/api/studios/${studioId}/presets`, {
        name: `Linked look ${Date.now().toString(36)}`,
        panelTypeId: 'el-amber-640x480',
      })
    ).json()
  ).preset;
  expect((await api(page, 'post', `/api/studios/${studioId}/presets/${preset.id}/links`, { artworkId })).status()).toBe(201);
  await page.getByRole('link', { name: 'Artworks' }).click();
  await page.getByRole('button', { name: `Delete ${name}` }).click();
  const dialog = page.getByRole('alertdialog');
  await expect(dialog).toContainText(
    `One live share link shows it (“${preset.name}”): they will show the studio’s newest other artwork instead.`,
  );
  await dialog.getByRole('button', { name: 'Cancel' }).click();
});

test('item 10: the drift result shows above the preview, in view, and can be closed', async ({ page, guard }, testInfo) => {
  void guard;
  await openBench(page);
  await page.getByRole('button', { name: 'Drift check' }).click();
  const result = page.getByTestId('drift-result');
  await expect(result).toBeVisible({ timeout: 30_000 });
  await expect(result).toBeInViewport();
  await expect(page.getByTestId('stage')).toBeInViewport();
  await page.screenshot({ path: testInfo.outputPath('drift.png') });
  await page.getByRole('button', { name: 'Close the drift check' }).click();
  await expect(result).toBeHidden();
});

test('item 14: the current look and the revision compare show an artwork the user picks', async ({ page, guard }) => {
  void guard;
  const studioId = await openBench(page);
  const name = `Look subject ${Date.now().toString(36)}`;
  await uploadArtwork(
    page,
    studioId,
    name,
    pngOf(64, 48, (x, y) => ((x + y) % 8 < 4 ? [255, 255, 255, 255] : [0, 0, 0, 255])),
  );
  const preset = (
    await (
      await api(page, 'post', `/api/studios/${studioId}/presets`, {
        name: `Shown on ${Date.now().toString(36)}`,
        panelTypeId: 'el-amber-640x480',
      })
    ).json()
  ).preset;
  await page.goto(`/studios/${studioId}/presets/${preset.id}`);
  await choose(page, 'Shown on', name);
  await expect(page.getByRole('img', { name: `Reference render of ${preset.name} on ${name}` })).toBeVisible({ timeout: 30_000 });
});

test('item 24: the calibration outline follows a drag and the arrow keys', async ({ page, guard }) => {
  void guard;
  await openBench(page);
  await page.getByRole('radio', { name: 'Real size' }).click();
  await page.getByRole('button', { name: 'Calibrate' }).click();
  const outline = page.getByRole('slider', { name: 'Card outline width' });
  const before = (await outline.boundingBox())!;
  // Drag the right edge 85.6 px further: one more screen pixel per millimetre of the card.
  await page.mouse.move(before.x + before.width - 2, before.y + before.height / 2);
  await page.mouse.down();
  await page.mouse.move(before.x + before.width - 2 + 85.6, before.y + before.height / 2, { steps: 5 });
  await page.mouse.up();
  const after = (await outline.boundingBox())!;
  expect(after.width - before.width).toBeCloseTo(85.6, 0);
  const value = Number(await outline.getAttribute('aria-valuenow'));
  await outline.press('ArrowRight');
  expect(Number(await outline.getAttribute('aria-valuenow'))).toBe(Math.round((value + 0.01) * 100) / 100);
});

test('item 4: four looks in a 2 × 2 split, each quadrant labelled', async ({ page, guard }, testInfo) => {
  void guard;
  await openBench(page);
  await choose(page, 'Compare with', 'Four looks (2 × 2)');
  const labels = page.getByTestId('quad-label');
  await expect(labels).toHaveCount(4);
  await expect(labels.nth(0)).toHaveText(/^A · /);
  await expect(labels.nth(3)).toHaveText(/^D · /);
  await choose(page, 'Preset D', /D: Line art, no dither/);
  await expect(labels.nth(3)).toHaveText('D · Line art, no dither');
  for (const q of ['Preset B, top right', 'Preset C, bottom left', 'Preset D, bottom right'])
    await expect(page.getByLabel(q)).toBeVisible();
  await waitForDraw(page, 0);
  await page.waitForTimeout(1500);
  await page.screenshot({ path: testInfo.outputPath('four.png') });
});

/** Every studio page a signed-in editor reaches, by its path under the studio. */
const PAGES = ['bench', 'presets', 'artworks', 'drive', 'bios', 'members', 'activity'];

test('axe: no serious or critical accessibility violations on any page (WCAG 2.1 A/AA rules)', async ({ page }) => {
  test.setTimeout(180_000);
  const studioId = await openBench(page);
  const found: string[] = [];
  const scan = async (where: string) => {
    await page.waitForLoadState('networkidle');
    const { violations, passes } = await new AxeBuilder({ page }).withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa']).analyze();
    // A scan that checked nothing would pass too: it must have run the rules on this page.
    expect(passes.length, `${where}: rules that passed`).toBeGreaterThan(10);
    for (const v of violations.filter((x) => x.impact === 'serious' || x.impact === 'critical'))
      found.push(
        `${where}: ${v.id} (${v.impact}) — ${v.help} — ${v.nodes
          .slice(0, 3)
          .map((n) => n.target.join(' '))
          .join(' | ')}`,
      );
  };
  for (const p of PAGES) {
    await page.goto(`/studios/${studioId}/${p}`);
    await expect(page.locator('h1')).toBeVisible();
    await scan(p);
  }
  await page.goto('/account');
  await scan('account');
  await page.context().clearCookies();
  await page.goto('/sign-in');
  await scan('sign-in');
  expect(found, found.join('\n')).toEqual([]);
});

test('at 390 × 844 every page fits the width and shows its heading', async ({ page }) => {
  await page.setViewportSize({ width: 390, height: 844 });
  const studioId = await openBench(page);
  for (const p of [...PAGES.map((x) => `/studios/${studioId}/${x}`), '/account', '/studios']) {
    await page.goto(p);
    await expect(page.locator('h1')).toBeVisible();
    await page.waitForLoadState('networkidle');
    const width = await page.evaluate(() => document.documentElement.scrollWidth);
    expect(width, `${p} is ${width} px wide`).toBeLessThanOrEqual(390);
  }
});
