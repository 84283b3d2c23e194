import { expect, test as base, type Page } from '@playwright/test';
import { E2E } from '../playwright.config';

interface CaughtMail {
  id: number;
  to: string[];
  subject: string;
  text: string;
}

/** Reads the e2e mail catcher's inbox (real SMTP from the server under test). */
export async function waitForMail(to: string, match: RegExp, timeoutMs = 10_000): Promise<string> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    const res = await fetch(`http://127.0.0.1:${E2E.mailUiPort}/api/messages`);
    const messages = (await res.json()) as CaughtMail[];
    const mail = messages
      .filter((m) => m.to.includes(to.toLowerCase()))
      .reverse()
      .find((m) => match.test(m.text));
    if (mail) return mail.text.match(match)![0];
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`no mail to ${to} matching ${match} within ${timeoutMs} ms`);
}

export const uniqueEmail = (tag: string) => `${tag}-${Date.now().toString(36)}${Math.random().toString(36).slice(2, 6)}@e2e.example`;

/** Every page: no request may leave 127.0.0.1, and the CSP must see no violation. */
export const test = base.extend<{ guard: { offHost: string[]; cspViolations: string[]; watch(page: Page): void } }>({
  guard: async ({ page }, use) => {
    const offHost: string[] = [];
    const cspViolations: string[] = [];
    const watch = (p: Page) => {
      p.on('request', (req) => {
        const url = new URL(req.url());
        if (!['data:', 'blob:'].includes(url.protocol) && url.hostname !== '127.0.0.1') offHost.push(req.url());
      });
      p.on('console', (msg) => {
        if (/Content Security Policy|Refused to/i.test(msg.text())) cspViolations.push(msg.text());
      });
      void p.addInitScript(() => {
        document.addEventListener('securitypolicyviolation', (e) =>
          console.error(`Refused to load: CSP ${e.violatedDirective} ${e.blockedURI}`),
        );
      });
    };
    watch(page);
    await use({ offHost, cspViolations, watch });
    expect(offHost, 'requests that left 127.0.0.1').toEqual([]);
    expect(cspViolations, 'Content-Security-Policy violations').toEqual([]);
  },
});

export { expect };

/** From a studio page, as its owner: invites a new address through the Members page and returns it. */
export async function inviteNewMember(page: Page, tag: string): Promise<string> {
  await page.getByRole('link', { name: 'Members' }).click();
  const invitee = uniqueEmail(tag);
  await page.getByRole('textbox', { name: 'E-mail' }).fill(invitee);
  await page.getByRole('button', { name: 'Send invite' }).click();
  await expect(page.getByRole('list', { name: 'Pending invites' })).toContainText(invitee);
  return invitee;
}

/** Signs in through the form. */
export async function signIn(page: Page, email: string, password: string): Promise<void> {
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
}
