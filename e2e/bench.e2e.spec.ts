import type { Page } from '@playwright/test';
import { readPngText } from '@shared/api/png-text';
import { PANEL_TYPES } from '@shared/model/panel-types';
import { choose, draws, drift, studioIdOf, thirdPartyArtworks, uploadArtwork, waitForDraw, type Drift } from './bench-helpers';

/**
 * The browser equals the reference within one 8-bit code value everywhere, and at most 0.01 % of
 * pixels differ at all. The shader forms v in the composer's order and encodes it with the
 * composer's own code thresholds, so only a v within float32 rounding of a threshold can land one
 * code apart (measured: 0–0.0008 % of pixels on the artworks below, every panel type).
 */
const withinOneCode = (d: Drift, what: string) => {
  expect.soft(d.maxChannel, `${what}: largest channel difference`).toBeLessThanOrEqual(1);
  expect.soft(d.share, `${what}: pixels differing at all`).toBeLessThanOrEqual(0.0001);
};
import { expect, signIn, test } from './fixtures';

test.describe.configure({ timeout: 600_000 });

/** Signs the demo editor in and waits for the bench's first draw. */
async function openBenchAsEditor(page: Page): Promise<void> {
  await signIn(page, 'editor@kilnquartz.example', 'amber-glow-demo');
  await expect(page).toHaveURL(/\/bench/);
  await waitForDraw(page, 0);
}

test('for every built-in panel type, on third-party artworks, the WebGL canvas equals the server reference within one code value', async ({
  page,
  guard,
}, testInfo) => {
  void guard;
  await signIn(page, 'editor@kilnquartz.example', 'amber-glow-demo');
  await expect(page).toHaveURL(/\/bench/);
  const studioId = studioIdOf(page.url());
  const artworks = await thirdPartyArtworks(page);
  const results: string[] = [];
  for (const art of artworks) {
    const id = await uploadArtwork(page, studioId, `${art.name}-${Date.now().toString(36)}`, art.bytes);
    await page.goto(`/studios/${studioId}/bench?artwork=${id}`);
    await waitForDraw(page, 0);
    // A freshly opened bench shows the first panel type.
    let current = PANEL_TYPES[0].id;
    for (const type of PANEL_TYPES) {
      if (type.id !== current) {
        const before = await draws(page);
        await choose(page, 'Panel type', type.name);
        await waitForDraw(page, before);
        current = type.id;
      }
      await expect(page.getByTestId('cpu-canvas')).toBeHidden();
      const d = await drift(page);
      results.push(`${art.name} on ${type.id}: ${(d.share * 100).toFixed(4)} % differ at all, largest channel difference ${d.maxChannel}`);
      withinOneCode(d, `${art.name} on ${type.id}`);
    }
    await page.screenshot({ path: testInfo.outputPath(`bench-${art.name}.png`) });
  }
  await testInfo.attach('drift.txt', { body: results.join('\n'), contentType: 'text/plain' });
  console.log(results.join('\n'));
});

test('upload through the library → open on the bench → change the glow → the canvas changes; the controls work by keyboard', async ({
  page,
  guard,
}, testInfo) => {
  void guard;
  await signIn(page, 'editor@kilnquartz.example', 'amber-glow-demo');
  await expect(page).toHaveURL(/\/bench/);
  const studioId = studioIdOf(page.url());
  await page.goto(`/studios/${studioId}/artworks`);
  const [heart] = await thirdPartyArtworks(page);
  await page.locator('input[type=file]').setInputFiles({ name: 'library-heart.png', mimeType: 'image/png', buffer: heart.bytes });
  await page.getByRole('link', { name: 'Open library-heart on the bench' }).first().click();
  const first = await waitForDraw(page, 0);
  const snapshot = () => page.getByTestId('live-canvas').evaluate((c: HTMLCanvasElement) => c.toDataURL());
  const before = await snapshot();
  const glow = page.getByRole('spinbutton', { name: 'Glow radius' });
  await glow.fill('1.5');
  await glow.press('Enter');
  const second = await waitForDraw(page, first);
  expect(await snapshot()).not.toEqual(before);

  // Keyboard: Tab to the glow share slider and nudge it with the arrow keys.
  const slider = page.getByRole('slider', { name: 'Glow share' });
  await slider.focus();
  const value = Number(await slider.inputValue());
  await page.keyboard.press('ArrowRight');
  await page.keyboard.press('ArrowRight');
  const third = await waitForDraw(page, second);
  expect(Number(await slider.inputValue())).toBeGreaterThan(value);
  withinOneCode(await drift(page), 'after a glow change');

  // A light edit redraws only the output stages from the cached panel result: still the reference.
  await page.getByRole('button', { name: 'Viewing' }).click();
  const exposure = page.getByRole('spinbutton', { name: 'Exposure' });
  await exposure.fill('1.5');
  await exposure.press('Enter');
  await waitForDraw(page, third);
  withinOneCode(await drift(page), 'after a light-only edit');
  await page.screenshot({ path: testInfo.outputPath('bench-glow.png') });

  // Keyboard: the first Tab offers a skip link past the bar and the navigation (issue "Workflow", item 25).
  await page.reload();
  await expect(page.getByRole('slider', { name: 'Glow share' })).toBeVisible();
  await page.keyboard.press('Tab');
  const skip = page.getByRole('link', { name: 'Skip to the page content' });
  await expect(skip).toBeFocused();
  await page.keyboard.press('Enter');
  await expect(page.locator('#page-content')).toBeFocused();
});

test('level spacing and frame-rate control: a typed duty table sets the levels; FRC shows its average, is flash-checked on a still, and plays its flicker on request', async ({
  page,
  guard,
}, testInfo) => {
  void guard;
  await openBenchAsEditor(page);
  // The demo still has soft tones (other tests leave flat icons in the library): it shows levels and their flicker.
  let draws0 = await draws(page);
  if (!(await page.getByRole('combobox', { name: 'Artwork' }).textContent())?.includes('Comic still: night kiln')) {
    await choose(page, 'Artwork', 'Comic still: night kiln');
    draws0 = await waitForDraw(page, draws0);
  }
  const snapshot = () => page.getByTestId('live-canvas').evaluate((c: HTMLCanvasElement) => c.toDataURL());
  const before = await snapshot();

  // A duty table: typed, then Tab; a bad one is kept in the field with what to fix.
  await choose(page, 'Level spacing', 'Duty table');
  draws0 = await waitForDraw(page, draws0);
  const table = page.getByRole('textbox', { name: /Duty table/ });
  await table.fill('0, 0.5, 0.3, 1');
  await table.press('Tab');
  await expect(page.getByRole('alert').filter({ hasText: 'value 3 (0.3) is not above value 2 (0.5)' })).toBeVisible();
  await expect(table).toHaveValue('0, 0.5, 0.3, 1');
  await table.fill('0, 0.03, 0.2, 0.6, 1');
  await table.press('Tab');
  draws0 = await waitForDraw(page, draws0);
  await expect(page.getByRole('spinbutton', { name: 'Gray levels' })).toHaveValue('5');
  expect(await snapshot()).not.toEqual(before);
  withinOneCode(await drift(page), 'with a duty table');

  // Frame-rate control on a still: the average is drawn, the flicker is checked and can be played.
  await choose(page, 'Dither', 'Frame-rate control, 2 frames');
  await waitForDraw(page, draws0);
  await expect(page.getByTestId('frc-note')).toContainText('the preview shows the average the eye sees');
  await expect(page.getByTestId('flash-ok').or(page.getByTestId('flash-warning'))).toContainText(/frame-rate control flicker/, {
    timeout: 30_000,
  });
  withinOneCode(await drift(page), 'frame-rate control average');
  const toggle = page.getByRole('switch', { name: 'Show the flicker' });
  if (await page.getByRole('button', { name: /I understand, allow the flicker/ }).isVisible())
    await page.getByRole('button', { name: /I understand, allow the flicker/ }).click();
  const averaged = await snapshot();
  await toggle.click();
  await expect(page.getByTestId('frc-note')).toContainText('plays each refresh of the cycle');
  const shown = () =>
    page
      .getByRole('switch', { name: 'Show the flicker' })
      .locator('xpath=ancestor::mat-slide-toggle')
      .getAttribute('data-refreshes-shown')
      .then(Number);
  await expect.poll(shown, { timeout: 15_000 }).toBeGreaterThan(4);
  // A refresh of the cycle is not the average.
  expect(await snapshot()).not.toEqual(averaged);
  await page.screenshot({ path: testInfo.outputPath('bench-frc.png') });
  await toggle.click();
  const stoppedAt = await shown();
  await page.waitForTimeout(300);
  expect(await shown()).toBe(stoppedAt);
  await expect.poll(snapshot).toEqual(averaged);
});

test('a bad file is refused with the reason, nothing is stored, and the page stays usable', async ({ page, guard }) => {
  void guard;
  await signIn(page, 'editor@kilnquartz.example', 'amber-glow-demo');
  await expect(page).toHaveURL(/\/bench/);
  const studioId = studioIdOf(page.url());
  await page.goto(`/studios/${studioId}/artworks`);
  await page
    .locator('input[type=file]')
    .setInputFiles({ name: 'not-really.png', mimeType: 'image/png', buffer: Buffer.from('<svg xmlns="http://www.w3.org/2000/svg"/>') });
  await expect(page.getByRole('alert').filter({ hasText: 'not a PNG, GIF, JPEG or WebP' })).toBeVisible();
  await expect(page.getByRole('link', { name: /Open not-really/ })).toHaveCount(0);
  await page.getByRole('button', { name: 'Dismiss the failed upload of not-really.png' }).click();
  await expect(page.getByRole('textbox', { name: 'Search by name' })).toBeEnabled();

  // A failed upload, then a good one: the old error goes, and a small GIF's size reads in bytes (issue "Workflow", item 16).
  await page
    .locator('input[type=file]')
    .setInputFiles({ name: 'again-not.png', mimeType: 'image/png', buffer: Buffer.from('<html></html>') });
  await expect(page.getByRole('alert').filter({ hasText: 'not a PNG, GIF, JPEG or WebP' })).toBeVisible();
  const tinyGif = Buffer.from('R0lGODlhAQABAIAAAP+wAAAAACH5BAAAAAAALAAAAAABAAEAAAICRAEAOw==', 'base64');
  const name = `tiny-${Date.now().toString(36)}`;
  await page.locator('input[type=file]').setInputFiles({ name: `${name}.gif`, mimeType: 'image/gif', buffer: tinyGif });
  await expect(page.getByRole('link', { name: new RegExp(`Open ${name}`) })).toBeVisible();
  await expect(page.getByRole('alert').filter({ hasText: 'not a PNG, GIF, JPEG or WebP' })).toHaveCount(0);
  await expect(page.getByText(`${tinyGif.length} bytes`)).toBeVisible();

  // Rename: the field takes the focus at once, ready to type over (item 16).
  await page.getByRole('button', { name: `Rename ${name}` }).click();
  const field = page.getByRole('textbox', { name: `New name for ${name}` });
  await expect(field).toBeFocused();
  await page.keyboard.type(`${name}-renamed`);
  await page.keyboard.press('Enter');
  await expect(page.getByRole('link', { name: `Open ${name}-renamed on the bench` })).toBeVisible();

  // Delete asks first, names what goes with it, and leaves the focus on the page heading, not on another card (item 5).
  await page.getByRole('button', { name: `Delete ${name}-renamed` }).click();
  const dialog = page.getByRole('alertdialog', { name: `Delete “${name}-renamed”?` });
  await expect(dialog).toContainText('every render made from it');
  await dialog.getByRole('button', { name: 'Delete artwork' }).click();
  await expect(page.getByRole('link', { name: `Open ${name}-renamed on the bench` })).toHaveCount(0);
  await expect(page.getByRole('heading', { name: 'Artworks', level: 1 })).toBeFocused();
});

test('controls another setting decides are read-only and say why; choices read as words, not codes', async ({ page, guard }) => {
  void guard;
  await openBenchAsEditor(page);

  // Halo from glass: the radius shows what the formula gives, read-only (issue "Workflow", item 15).
  await page.getByRole('switch', { name: 'Halo from glass' }).click();
  const thickness = page.getByRole('spinbutton', { name: 'Glass thickness' });
  await thickness.fill('3');
  await thickness.press('Enter');
  const halo = page.getByRole('spinbutton', { name: 'Halo radius' });
  const n = PANEL_TYPES[0].defaults.glass.refractiveIndex;
  // r = 2·t·tan(asin(1/n)) [classical faceplate optics, from memory; docs/references.md].
  await expect.poll(async () => Number(await halo.inputValue())).toBeCloseTo(2 * 3 * Math.tan(Math.asin(1 / n)), 3);
  await expect(halo).toHaveAttribute('readonly', '');
  await expect(halo).toHaveAccessibleDescription(/From the glass/);
  await expect(page.getByRole('slider', { name: /^Halo radius/ })).toHaveCount(0);

  // A saved timing drives the refresh rate: the field shows it read-only and names the timing (item 11).
  await choose(page, 'Drive timing', /^Handheld EL, 60 Hz/);
  const refresh = page.getByRole('spinbutton', { name: 'Refresh rate' });
  await expect(refresh).toHaveValue('59.94');
  await expect(refresh).toHaveAttribute('readonly', '');
  await expect(refresh).toHaveAccessibleDescription(/Set by the drive timing “Handheld EL, 60 Hz”/);
  await choose(page, 'Drive timing', "Panel type's own refresh");
  await expect(refresh).not.toHaveAttribute('readonly');

  // Choices are offered by their labels (item 12).
  await page.getByRole('combobox', { name: 'Dither' }).click();
  await expect(page.getByRole('option', { name: 'Error diffusion (Floyd–Steinberg)' })).toBeVisible();
  await expect(page.getByRole('option', { name: 'floyd-steinberg' })).toHaveCount(0);
  await page.keyboard.press('Escape');
});

for (const viewport of [
  { width: 1280, height: 800 },
  { width: 390, height: 844 },
]) {
  test(`at ${viewport.width}×${viewport.height} the preview stays in view while every control group is open and the controls scroll`, async ({
    page,
    guard,
  }) => {
    void guard;
    await page.setViewportSize(viewport);
    await signIn(page, 'editor@kilnquartz.example', 'amber-glow-demo');
    await expect(page).toHaveURL(/\/bench/);
    await waitForDraw(page, 0);
    const stage = page.getByTestId('stage');
    // Issue "Workflow", item 1: the preview is on screen from the start (on a phone, before the controls)…
    await expect(stage).toBeInViewport({ ratio: 0.5 });
    // …and stays there with every group open, at a control in the middle and at the last one.
    for (const group of ['Cell', 'Emission', 'Viewing']) await page.getByRole('button', { name: group, exact: true }).click();
    for (const control of ['Reset Cell', 'Reset Viewing']) {
      const button = page.getByRole('button', { name: control });
      await button.scrollIntoViewIfNeeded();
      await expect(button).toBeInViewport();
      await expect(stage).toBeInViewport({ ratio: 0.5 });
    }
    // A change made down there shows in the preview without scrolling back.
    const before = await draws(page);
    const exposure = page.getByRole('spinbutton', { name: 'Exposure' });
    await exposure.fill('1');
    await exposure.press('Enter');
    await waitForDraw(page, before);
    await expect(stage).toBeInViewport({ ratio: 0.5 });
  });
}

test('the compare divider follows a drag across the stage, can be grabbed again at either edge, and moves by keyboard; both sides are labelled', async ({
  page,
  guard,
}) => {
  void guard;
  await openBenchAsEditor(page);
  await choose(page, 'Compare with', 'Original artwork');
  const stage = page.getByTestId('stage');
  const preview = page.getByRole('group', { name: 'Preview' });
  await expect(preview.getByText(/^A · /)).toBeVisible();
  await expect(preview.getByText('B · Original artwork')).toBeVisible();
  const divider = page.getByRole('slider', { name: 'Compare divider' });
  const box = (await stage.boundingBox())!;
  const y = box.y + box.height / 2;
  // Issue "Workflow", item 4: a drag to a quarter of the width puts the divider there (it used to jump to 0).
  const dragTo = async (share: number) => {
    const d = (await divider.boundingBox())!;
    await page.mouse.move(d.x + d.width / 2, y);
    await page.mouse.down();
    await page.mouse.move(box.x + box.width * share, y, { steps: 8 });
    await page.mouse.up();
  };
  const at = async () => Number(await divider.getAttribute('aria-valuenow'));
  await dragTo(0.25);
  expect(Math.abs((await at()) - 25)).toBeLessThanOrEqual(2);
  await dragTo(1.2);
  expect(await at()).toBe(100);
  // At the right edge it can still be grabbed and brought back.
  await dragTo(0.6);
  expect(Math.abs((await at()) - 60)).toBeLessThanOrEqual(2);
  await divider.focus();
  // Each key's result is awaited (the attribute updates on the next render, not synchronously).
  await page.keyboard.press('Home');
  await expect(divider).toHaveAttribute('aria-valuenow', '0');
  await page.keyboard.press('End');
  await expect(divider).toHaveAttribute('aria-valuenow', '100');
  await page.keyboard.press('PageDown');
  await expect(divider).toHaveAttribute('aria-valuenow', '90');
  await expect(divider).toHaveAttribute('aria-valuetext', /90 % A: .+, the rest B: Original artwork/);
});

test('the view pans by drag and keys and zooms about the pointer (wheel with Ctrl, + and −); the inspector finds the cell under the pointer through it', async ({
  page,
  guard,
}) => {
  void guard;
  await openBenchAsEditor(page);
  const preview = page.getByRole('group', { name: 'Preview' });
  const stage = page.getByTestId('stage');
  const inspector = page.getByTestId('inspector');
  const zoomShown = async () => Number((await page.getByTestId('view-zoom').textContent())!.replace(/[^\d]/g, ''));
  const cellAt = async (x: number, y: number) => {
    await page.mouse.move(x, y);
    const [, c, r] = (await inspector.textContent())!.match(/cell (\d+), (\d+)/)!.map(Number);
    return { c, r };
  };
  await preview.scrollIntoViewIfNeeded();
  const wrap = (await preview.boundingBox())!;
  const middle = { x: wrap.x + wrap.width / 2, y: wrap.y + wrap.height / 2 };
  const before = await cellAt(middle.x, middle.y);
  const fitted = await zoomShown();

  // Ctrl + wheel zooms about the pointer: the same cell stays under it.
  await page.keyboard.down('Control');
  await page.mouse.wheel(0, -600);
  await page.keyboard.up('Control');
  await expect.poll(zoomShown).toBeGreaterThan(fitted * 2);
  const zoomed = await cellAt(middle.x, middle.y);
  expect(Math.abs(zoomed.c - before.c)).toBeLessThanOrEqual(1);
  expect(Math.abs(zoomed.r - before.r)).toBeLessThanOrEqual(1);

  // A drag moves the image with the pointer: the cell that was under the start is under the end.
  const start = (await stage.boundingBox())!;
  await page.mouse.move(middle.x, middle.y);
  await page.mouse.down();
  await page.mouse.move(middle.x - 120, middle.y - 40, { steps: 6 });
  await page.mouse.up();
  const moved = (await stage.boundingBox())!;
  expect(moved.x - start.x).toBeCloseTo(-120, 0);
  expect(moved.y - start.y).toBeCloseTo(-40, 0);
  const dragged = await cellAt(middle.x - 120, middle.y - 40);
  expect(Math.abs(dragged.c - zoomed.c)).toBeLessThanOrEqual(1);

  // On the focused preview the keys work too; 0 and Reset view go back to Fit.
  await preview.focus();
  const keyed = await zoomShown();
  await page.keyboard.press('-');
  await expect.poll(zoomShown).toBeLessThan(keyed);
  await page.keyboard.press('ArrowLeft');
  await expect.poll(async () => (await stage.boundingBox())!.x).toBeGreaterThan(moved.x);
  await page.keyboard.press('0');
  await expect.poll(zoomShown).toBe(fitted);
  await page.getByRole('button', { name: 'Zoom in' }).click();
  await page.getByRole('button', { name: 'Reset view' }).click();
  await expect.poll(zoomShown).toBe(fitted);
  await expect(page.getByRole('button', { name: 'Reset view' })).toHaveCount(0);
});

test('the current view downloads as the reference PNG at this scale, with its parameters inside the file', async ({ page, guard }) => {
  void guard;
  await openBenchAsEditor(page);
  const glow = page.getByRole('spinbutton', { name: 'Glow radius' });
  await glow.fill('0.4');
  await glow.press('Enter');
  // Issue "Workflow", item 27.
  const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Download PNG' }).click()]);
  expect(download.suggestedFilename()).toMatch(/\.png$/);
  const bytes = new Uint8Array(await (await download.createReadStream()).toArray().then((parts) => Buffer.concat(parts)));
  const text = readPngText(bytes);
  expect(text.Software).toBe('Emberline');
  const saved = JSON.parse(text['Emberline parameters']);
  expect(saved.parameters.glass.glowRadiusMm).toBe(0.4);
  expect(saved.scale).toBe(2);
  // The picture is the live view's size: 640 × 480 cells at 2 px a pitch [IHDR width and height].
  const view = new DataView(bytes.buffer, bytes.byteOffset);
  expect([view.getUint32(16), view.getUint32(20)]).toEqual([1280, 960]);
});

test('unsaved tuning is marked, can be reverted, and is never dropped by a panel-type switch without asking', async ({ page, guard }) => {
  void guard;
  await openBenchAsEditor(page);
  const glow = page.getByRole('spinbutton', { name: 'Glow radius' });
  const original = await glow.inputValue();
  await glow.fill('1.5');
  await glow.press('Enter');
  // Issue "Workflow", item 3.
  await expect(page.getByRole('status').filter({ hasText: 'Modified since the built-in preset (1 change)' })).toBeVisible();
  const type = page.getByRole('combobox', { name: 'Panel type' });
  const before = (await type.textContent())!.trim();
  await type.click();
  await page.getByRole('option', { name: PANEL_TYPES[1].name }).click();
  const dialog = page.getByRole('alertdialog', { name: `Switch to ${PANEL_TYPES[1].name}?` });
  await expect(dialog).toContainText(`Glow radius ${Number(original).toFixed(2)} mm → 1.50 mm`);
  await dialog.getByRole('button', { name: 'Cancel' }).click();
  await expect(type).toHaveText(before);
  await expect(glow).toHaveValue('1.5');
  // Revert puts the preset's value back.
  await page.getByRole('button', { name: 'Revert' }).click();
  await expect(glow).toHaveValue(original);
  await expect(page.getByText(/Modified since/)).toHaveCount(0);
  // Tuned again, then switched on purpose.
  await glow.fill('1.5');
  await glow.press('Enter');
  await type.click();
  await page.getByRole('option', { name: PANEL_TYPES[1].name }).click();
  await page.getByRole('alertdialog').getByRole('button', { name: 'Discard changes and switch' }).click();
  await expect(type).toHaveText(PANEL_TYPES[1].name);
  await expect(glow).toHaveValue(String(PANEL_TYPES[1].defaults.glass.glowRadiusMm));
});

test('playback sits above the preview with speed and loop; without loop it stops on the last frame, and a drift check pauses it', async ({
  page,
  guard,
}) => {
  void guard;
  await signIn(page, 'editor@kilnquartz.example', 'amber-glow-demo');
  await expect(page).toHaveURL(/\/bench/);
  await choose(page, 'Artwork', 'Walk cycle');
  const animation = page.getByRole('group', { name: 'Animation' });
  const play = animation.getByRole('button', { name: 'Play' });
  // Issue "Workflow", item 23: on screen at 1280 × 800, above the canvas.
  await expect(play).toBeInViewport();
  expect((await play.boundingBox())!.y).toBeLessThan((await page.getByTestId('stage').boundingBox())!.y);
  const position = page.getByTestId('frame-position');
  const count = Number((await position.textContent())!.match(/\/ (\d+)/)![1]);
  expect(count).toBeGreaterThan(1);
  await choose(page, 'Playback speed', '4×');
  await animation.getByRole('switch', { name: 'Loop' }).click();
  await play.click();
  await expect(position).toHaveText(`frame ${count} / ${count}`, { timeout: 10_000 });
  await expect(animation.getByRole('button', { name: 'Play' })).toBeVisible();
  await page.waitForTimeout(600);
  await expect(position).toHaveText(`frame ${count} / ${count}`);
  // Looping again: a drift check stops playback so it checks the frame on screen (item 10).
  await animation.getByRole('switch', { name: 'Loop' }).click();
  await animation.getByRole('button', { name: 'Play' }).click();
  await expect(animation.getByRole('button', { name: 'Pause' })).toBeVisible();
  await page.getByRole('button', { name: 'Drift check' }).click();
  await expect(animation.getByRole('button', { name: 'Play' })).toBeVisible();
});
