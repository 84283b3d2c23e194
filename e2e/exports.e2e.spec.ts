import { PNG } from 'pngjs';
import sharp from 'sharp';
import type { Page } from '@playwright/test';
import { sheetGeometry } from '@shared/export/sheet';
import { choose, studioIdOf } from './bench-helpers';
import { expect, signIn, test } from './fixtures';

/** Picks several options of a multiple mat-select, then closes its panel. */
async function chooseMany(page: Page, select: RegExp, options: (string | RegExp)[]): Promise<void> {
  await page.getByRole('combobox', { name: select }).click();
  for (const option of options) await page.getByRole('option', { name: option }).click();
  await page.keyboard.press('Escape');
}

const xsrf = async (page: Page) => (await page.context().cookies()).find((c) => c.name === 'XSRF-TOKEN')!.value;

test('a 2 × 2 comparison sheet: asked for on the Exports page, followed to Ready, downloaded, shared by a link that opens without an account, its cells equal to single reference renders', async ({
  page,
  guard,
}, testInfo) => {
  void guard;
  await signIn(page, 'editor@kilnquartz.example', 'amber-glow-demo');
  await expect(page).toHaveURL(/\/bench/);
  const studioId = studioIdOf(page.url());
  await page.getByRole('link', { name: 'Exports' }).click();
  await expect(page.getByRole('heading', { name: 'Exports', level: 1 })).toBeVisible();

  // The form says what is missing before anything can be sent.
  await expect(page.getByText('Choose at least one artwork.')).toBeVisible();
  await expect(page.getByRole('button', { name: 'Make sheet' })).toBeDisabled();
  const title = `Client sheet ${Date.now().toString(36)}`;
  await page.getByLabel('Title (optional)').fill(title);
  await choose(page, 'Layout', 'Grid: artworks down, looks across');
  await chooseMany(page, /^Artworks/, ['Title screen', /^Walk cycle/]);
  const looks = [/^Standard · Amber EL 320 × 240/, /^Standard · Vacuum fluorescent/];
  await chooseMany(page, /^Looks/, looks);
  await choose(page, 'Scale', '1 px a cell pitch');
  await expect(page.getByText(/4 cells · a sheet of [\d,]+ × [\d,]+ px/)).toBeVisible();
  await page.getByRole('button', { name: 'Make sheet' }).click();

  // Its progress shows while it is made, then it is ready to download.
  const item = page.getByRole('listitem').filter({ hasText: title });
  await expect(item).toBeVisible();
  await expect(item.getByText('Ready', { exact: true })).toBeVisible({ timeout: 30_000 });
  await expect(item.getByRole('progressbar')).toHaveCount(0);
  await page.screenshot({ path: testInfo.outputPath('exports-laptop.png'), fullPage: true });

  // A reload keeps it (the jobs and their state live on the server).
  await page.reload();
  await expect(page.getByRole('listitem').filter({ hasText: title }).getByText('Ready', { exact: true })).toBeVisible();
  const [download] = await Promise.all([
    page.waitForEvent('download'),
    page.getByRole('link', { name: new RegExp(`^Download ${title}: Sheet \\(PNG\\)`) }).click(),
  ]);
  expect(download.suggestedFilename()).toBe(`${title}.png`);
  const sheet = PNG.sync.read(Buffer.concat(await (await download.createReadStream()).toArray()));

  // A share link for the client: opened in a browser with no session, it shows the sheet and downloads it.
  await item.getByRole('button', { name: `Share links of ${title}` }).click();
  await item.getByRole('button', { name: 'New share link' }).click();
  const shareUrl = await item.getByRole('textbox', { name: /The new share link/ }).inputValue();
  expect(shareUrl).toMatch(/\/shared-exports\/[\w-]{40,}$/);
  const client = await page.context().browser()!.newContext();
  const clientPage = await client.newPage();
  guard.watch(clientPage);
  await clientPage.goto(shareUrl);
  await expect(clientPage.getByRole('heading', { name: title })).toBeVisible();
  const preview = clientPage.getByRole('img', { name: `Comparison sheet: ${title}` });
  await expect(preview).toBeVisible();
  expect(await preview.evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth)).toBe(sheet.width);
  const [shared] = await Promise.all([
    clientPage.waitForEvent('download'),
    clientPage.getByRole('link', { name: /^Download Sheet \(PNG\)/ }).click(),
  ]);
  expect(PNG.sync.read(Buffer.concat(await (await shared.createReadStream()).toArray())).width).toBe(sheet.width);
  await client.close();

  // The server says where each cell went; each cut out equals the studio's reference render of it.
  const list = await (await page.request.get(`/api/studios/${studioId}/exports`)).json();
  const made = list.exports.find((e: { title: string }) => e.title === title);
  expect([sheet.width, sheet.height]).toEqual([made.width, made.height]);
  const renders: PNG[][] = [];
  for (const artwork of made.artworks) {
    const row: PNG[] = [];
    for (const look of made.looks) {
      const res = await page.request.post(`/api/studios/${studioId}/renders`, {
        headers: { 'X-XSRF-TOKEN': await xsrf(page) },
        data: { artworkId: artwork.id, presetId: look.id, scale: 1 },
      });
      expect(res.ok()).toBe(true);
      row.push(PNG.sync.read(await (await page.request.get((await res.json()).render.url)).body()));
    }
    renders.push(row);
  }
  // Where each cell went, by the layout rules (their arithmetic is checked in shared/export/sheet.spec.ts).
  const geometry = sheetGeometry(renders.map((row) => row.map((p) => ({ width: p.width, height: p.height }))));
  renders.forEach((row, r) =>
    row.forEach((render, c) => {
      const at = geometry.cells[r][c].image;
      let differing = 0;
      for (let yy = 0; yy < render.height; yy++) {
        for (let xx = 0; xx < render.width; xx++) {
          const s = ((at.y + yy) * sheet.width + at.x + xx) * 4;
          const p = (yy * render.width + xx) * 4;
          if (sheet.data[s] !== render.data[p] || sheet.data[s + 1] !== render.data[p + 1] || sheet.data[s + 2] !== render.data[p + 2])
            differing++;
        }
      }
      expect(differing, `cell ${r},${c}`).toBe(0);
    }),
  );
});

test('the Exports page on a phone: the form and the list fit 390 px', async ({ page, guard }, testInfo) => {
  void guard;
  await page.setViewportSize({ width: 390, height: 844 });
  await signIn(page, 'owner@kilnquartz.example', 'amber-glow-demo');
  await expect(page).toHaveURL(/\/bench/);
  await page.goto(page.url().replace(/\/bench.*$/, '/exports'));
  await expect(page.getByRole('heading', { name: 'Exports', level: 1 })).toBeVisible();
  await expect(page.getByRole('button', { name: 'Make sheet' })).toBeVisible();
  const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
  expect(overflow).toBeLessThanOrEqual(0);
  await page.screenshot({ path: testInfo.outputPath('exports-phone.png'), fullPage: true });
});

test('Add to sheet on the bench starts a sheet with the artwork and look on the bench', async ({ page, guard }) => {
  void guard;
  await signIn(page, 'editor@kilnquartz.example', 'amber-glow-demo');
  await expect(page).toHaveURL(/\/bench/);
  await choose(page, 'Artwork', 'Walk cycle');
  await page.getByRole('link', { name: 'Add to sheet' }).click();
  await expect(page).toHaveURL(/\/exports\?artwork=.+&look=/);
  await expect(page.getByRole('combobox', { name: /^Artworks/ })).toContainText('Walk cycle');
  await expect(page.getByRole('combobox', { name: /^Looks/ })).toContainText('Standard');
  await expect(page.getByText(/1 cell · a sheet of/)).toBeVisible();
  // An animation: the frame can be chosen, and a frame past its end is refused before sending.
  await page.getByLabel('Animation frame').fill('9');
  await expect(page.getByText('Choose a frame from 1 to 4.')).toBeVisible();
  await expect(page.getByRole('button', { name: 'Make sheet' })).toBeDisabled();
  await expect(page.getByRole('checkbox', { name: /^Analysis under each render/ })).not.toBeChecked();

  // From the bench's Analysis: the same, with the analysis under each render.
  await page.goBack();
  await choose(page, 'Artwork', 'Walk cycle');
  await page.getByRole('button', { name: 'Analysis' }).click();
  await page.getByRole('link', { name: 'Add to sheet with this analysis' }).click();
  await expect(page.getByRole('checkbox', { name: /^Analysis under each render/ })).toBeChecked();
  await expect(page.getByRole('combobox', { name: /^Artworks/ })).toContainText('Walk cycle');
});

test('an animation through a look: made in the background, with its flash check, downloaded as GIF with every frame', async ({
  page,
  guard,
}) => {
  void guard;
  await signIn(page, 'editor@kilnquartz.example', 'amber-glow-demo');
  await expect(page).toHaveURL(/\/bench/);
  await page.getByRole('link', { name: 'Exports' }).click();
  await page.getByRole('radio', { name: 'Animation' }).click();
  await expect(page.getByText('Choose an animation.')).toBeVisible();
  const title = `Walk ${Date.now().toString(36)}`;
  await page.getByLabel('Title (optional)').fill(title);
  await choose(page, 'Animation', /^Walk cycle · 4 frames/);
  await choose(page, 'Look', /^Standard · Amber EL 320 × 240/);
  await choose(page, 'Scale', '1 px a cell pitch');
  await expect(page.getByText(/4 frames of 320 × 240 px/)).toBeVisible();
  await page.getByRole('button', { name: 'Make animation' }).click();
  const item = page.getByRole('listitem').filter({ hasText: title });
  await expect(item.getByText('Ready', { exact: true })).toBeVisible({ timeout: 30_000 });
  await expect(item).toContainText('Animation · 4 frames');
  await expect(item).toContainText(/Flash check at 600 mm: passes/);
  const [download] = await Promise.all([page.waitForEvent('download'), item.getByRole('link', { name: /Animation \(GIF/ }).click()]);
  expect(download.suggestedFilename()).toBe(`${title}.gif`);
  const meta = await sharp(Buffer.concat(await (await download.createReadStream()).toArray()), { animated: true }).metadata();
  expect([meta.pages, meta.width, meta.pageHeight]).toEqual([4, 320, 240]);
});
