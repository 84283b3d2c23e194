import { expect, inviteNewMember, signIn, test, waitForMail } from './fixtures';

// Issue "Workflow", item 19: a member the owner removed is told so, not that the studio is missing.
test('an invited member joins, is removed by the owner, and on reload reads that they are no longer a member', async ({
  page,
  browser,
  guard,
}) => {
  await signIn(page, 'owner@kilnquartz.example', 'amber-glow-demo');
  await expect(page).toHaveURL(/\/bench$/);
  const invitee = await inviteNewMember(page, 'leaver');

  // The invitee follows the mailed link, creates the account there (the link proves the address) and joins.
  const inviteLink = await waitForMail(invitee, /http:\/\/127\.0\.0\.1:\d+\/invites\/[A-Za-z0-9_-]+/);
  const context = await browser.newContext();
  const member = await context.newPage();
  guard.watch(member);
  await member.goto(inviteLink);
  await member.getByRole('link', { name: 'Create an account' }).click();
  await member.getByLabel('Your name').fill('Lee Leaver');
  await member.getByLabel('E-mail').fill(invitee);
  await member.getByLabel('Password').fill('leaver passphrase');
  await member.getByRole('button', { name: 'Create account' }).click();
  await member.getByRole('button', { name: /^Join / }).click();
  await expect(member).toHaveURL(/\/bench$/);
  const studioUrl = member.url();

  await page.reload();
  // Removing asks first and names what it means (issue "Workflow", item 5); Cancel keeps the member.
  await page.getByRole('button', { name: 'Remove Lee Leaver' }).click();
  const dialog = page.getByRole('alertdialog', { name: 'Remove Lee Leaver?' });
  await expect(dialog).toContainText('Lee Leaver loses access to Kiln & Quartz at once');
  await expect(dialog.getByRole('button', { name: 'Cancel' })).toBeFocused();
  await dialog.getByRole('button', { name: 'Cancel' }).click();
  await expect(page.getByRole('table', { name: 'Studio members' })).toContainText(invitee);
  await page.getByRole('button', { name: 'Remove Lee Leaver' }).click();
  await page.getByRole('alertdialog').getByRole('button', { name: 'Remove member' }).click();
  await expect(page.getByRole('table', { name: 'Studio members' })).not.toContainText(invitee);

  await member.goto(studioUrl);
  await expect(member.getByRole('alert')).toContainText('You are no longer a member of this studio');
  await context.close();
});
