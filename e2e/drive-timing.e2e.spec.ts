import { expect, signIn, test } from './fixtures';

test('an editor works out an EL drive timing and saves it; the viewer sees it without edit controls', async ({
  page,
  browser,
  guard,
}, testInfo) => {
  await signIn(page, 'editor@kilnquartz.example', 'amber-glow-demo');
  await page.getByRole('link', { name: 'Drive timing' }).click();
  await expect(page.getByRole('heading', { name: 'High voltage: read before you probe' })).toBeVisible();
  // A new timing has no name until the user gives one (issue "Workflow", item 22).
  await expect(page.getByRole('textbox', { name: 'Name', exact: true })).toHaveValue('');
  // DMT 640×480@60, dual-scan, 4 pixels a clock [std DMT row; calc shift clock 25.175 / 8].
  await expect(page.getByText('25.175 MHz', { exact: true })).toBeVisible();
  await expect(page.getByText('31.469 kHz', { exact: true })).toBeVisible();
  await expect(page.getByText('3.147 MHz', { exact: true })).toBeVisible();
  await expect(page.getByLabel('CR00 to CR18 in hex')).toContainText('5F 4F 50 83 52 9E 0B 3E 00 40');
  await expect(page.getByRole('img', { name: /Timing diagram of one line and one frame/ })).toBeVisible();

  // CVT reduced blanking v2 for the same size [std worked result: 21.384 MHz].
  await page.getByRole('combobox', { name: 'Standard' }).click();
  await page.getByRole('option', { name: 'CVT reduced blanking v2' }).click();
  await page.getByRole('textbox', { name: /Mode/ }).fill('640x480@60');
  await expect(page.getByText('21.384 MHz', { exact: true })).toBeVisible();

  // A timing by hand that refreshes too slowly for EL gets a warning.
  await page.getByRole('radio', { name: 'By hand' }).click();
  await page.getByRole('spinbutton', { name: 'Pixel clock (MHz)' }).fill('15');
  await expect(page.getByText(/EL panels are usually refreshed at 60–120 Hz/)).toBeVisible();
  await page.getByRole('spinbutton', { name: 'Pixel clock (MHz)' }).fill('0');
  await expect(page.getByRole('alert').filter({ hasText: 'This timing cannot be used' })).toBeVisible();
  await page.getByRole('spinbutton', { name: 'Pixel clock (MHz)' }).fill('25.175');

  const name = `E2E timing ${Date.now().toString(36)}`;
  await page.getByRole('textbox', { name: 'Name', exact: true }).fill(name);
  await page.getByRole('button', { name: 'Save timing' }).click();
  await expect(page.getByRole('list', { name: 'Saved timings' })).toContainText(name);
  await page.screenshot({ path: testInfo.outputPath('drive-editor.png') });

  const context = await browser.newContext();
  const viewer = await context.newPage();
  guard.watch(viewer);
  await signIn(viewer, 'viewer@kilnquartz.example', 'amber-glow-demo');
  await viewer.getByRole('link', { name: 'Drive timing' }).click();
  await expect(viewer.getByRole('list', { name: 'Saved timings' })).toContainText(name);
  await viewer.getByRole('button', { name: `Open ${name}` }).click();
  await expect(viewer.getByRole('spinbutton', { name: 'Pixel clock (MHz)' })).toHaveValue('25.175');
  await expect(viewer.getByRole('button', { name: /Save/ })).toHaveCount(0);
  await expect(viewer.getByRole('button', { name: `Delete ${name}` })).toHaveCount(0);
  await context.close();
});

test('modes are read as written, switching standard keeps a mode that means something, and a timing too wide for the VBE block is refused beside its fields', async ({
  page,
}) => {
  await signIn(page, 'editor@kilnquartz.example', 'amber-glow-demo');
  await page.getByRole('link', { name: 'Drive timing' }).click();
  // The VGA BIOS mode, then CVT: the mode box shows a mode CVT can read, and the results follow it (issue "Workflow", item 7).
  await page.getByRole('combobox', { name: 'Mode' }).click();
  await page.getByRole('option', { name: 'VGA BIOS mode 12h (640×480)' }).click();
  await page.getByRole('combobox', { name: 'Standard' }).click();
  await page.getByRole('option', { name: 'CVT 1.2' }).click();
  const mode = page.getByRole('textbox', { name: /Mode/ });
  await expect(mode).toHaveValue('640x480@60');
  await expect(page.getByRole('img', { name: /Timing diagram/ })).not.toContainText('vga-mode-12h');
  // CVT 640×480@60 [calc, agreeing with published modelines: 23.75 MHz; docs/references.md].
  await expect(page.getByText('23.750 MHz', { exact: true })).toBeVisible();
  // Spaced, as the label writes it.
  await mode.fill('800 x 600 @ 60');
  // CVT 800×600@60 [from memory of published modelines: 38.25 MHz; docs/references.md].
  await expect(page.getByText('38.250 MHz', { exact: true })).toBeVisible();
  // Out of range is a range message, not a format one.
  await mode.fill('0x0@0');
  await expect(page.getByRole('alert').filter({ hasText: 'width must be a whole number from 64 to 8192, got 0' })).toBeVisible();

  // By hand, 100000 × 100000: refused beside the horizontal and vertical fields, naming the field and its width (item 8).
  await page.getByRole('radio', { name: 'By hand' }).click();
  const horizontal = page.getByRole('group', { name: 'Horizontal (pixels)' });
  await horizontal.getByRole('spinbutton', { name: 'Active' }).fill('100000');
  await expect(horizontal.getByRole('alert')).toContainText(
    "the horizontal total (pixels) would be 100160, more than the VBE block's 16-bit HorizontalTotal field holds (at most 65535)",
  );
  await expect(page.getByLabel('CRTC information block bytes')).toHaveCount(0);
  await page.getByRole('textbox', { name: 'Name', exact: true }).fill('Too wide');
  await page.getByRole('button', { name: 'Save timing' }).click();
  await expect(page.getByRole('list', { name: 'Saved timings' })).not.toContainText('Too wide');
  await horizontal.getByRole('spinbutton', { name: 'Active' }).fill('640');
  await expect(horizontal.getByRole('alert')).toHaveCount(0);
  await expect(page.getByLabel('CRTC information block bytes')).toContainText('20 03');
});
