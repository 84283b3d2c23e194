import { expect, signIn, test } from './fixtures';

test('an editor works out an EL drive timing and saves it; the viewer sees it without edit controls', async ({ page, browser, guard }, testInfo) => {
  await signIn(page, 'editor@kilnquartz.example', 'amber-glow-demo');
  await page.getByRole('link', { name: 'Drive timing' }).click();
  await expect(page.getByRole('heading', { name: 'High voltage: read before you probe' })).toBeVisible();
  // A new timing has no name until the user gives one (issue "Workflow", item 22).
  await expect(page.getByRole('textbox', { name: 'Name' })).toHaveValue('');
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
  await page.getByRole('textbox', { name: 'Name' }).fill(name);
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
