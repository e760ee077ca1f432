import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { baseUrl, useBrowserPage } from './support/browser';

const DEMO_PASSWORD = 'Ampwright-demo-1';

describe('accounts in a real browser', () => {
  const s = useBrowserPage({ beforeAll, afterAll, beforeEach });

  async function signIn(email: string, password: string) {
    await s.page.getByLabel('E-mail address').fill(email);
    await s.page.getByLabel('Password').fill(password);
    await s.page.getByRole('button', { name: 'Sign in' }).click();
  }

  it('sends a deep link to sign in, then back to it, with firm and roles in the shell; signing out ends the session', async () => {
    await s.page.goto(`${baseUrl()}/projects/p1/sheets/s1`);
    await s.page.waitForURL(/\/sign-in\?next=/);
    await signIn('engineer@northfold.example', DEMO_PASSWORD);
    await s.page.waitForURL(/\/projects\/p1\/sheets\/s1$/);
    await expect.poll(() => s.page.getByTestId('firm-and-roles').textContent()).toBe('Northfold Engineering · Engineer');
    await s.page.getByRole('button', { name: 'Sign out' }).click();
    await s.page.waitForURL(/\/sign-in$/);
    await s.page.goto(`${baseUrl()}/projects`);
    await s.page.waitForURL(/\/sign-in\?next=/);
  });

  it('says so, beside nothing else, when the password is wrong', async () => {
    await s.page.goto(`${baseUrl()}/sign-in`);
    await signIn('approver@northfold.example', 'not the password');
    await expect.poll(() => s.page.getByRole('alert').textContent()).toBe('The e-mail address or the password is not right.');
  });

  it('shows field messages before sending a form that is not complete', async () => {
    await s.page.goto(`${baseUrl()}/register`);
    await s.page.getByLabel('Firm name').fill('Quillon Power Studies');
    await s.page.getByLabel('Password').fill('short');
    await s.page.getByRole('button', { name: 'Register' }).click();
    await expect.poll(() => s.page.getByText('Use at least 12 characters').count()).toBe(1);
    expect(await s.page.getByText('Enter your name').count()).toBe(1);
  });

  it('registers a firm by the e-mailed link and lets its owner see the members page', async () => {
    const email = `owner-${Date.now()}@quillon.example`;
    await s.page.goto(`${baseUrl()}/register`);
    await s.page.getByLabel('Firm name').fill('Quillon Power Studies');
    await s.page.getByLabel('Your name').fill('Rhiannon Vale');
    await s.page.getByLabel('E-mail address').fill(email);
    await s.page.getByLabel('Password').fill('a long enough passphrase');
    await s.page.getByRole('button', { name: 'Register' }).click();
    await s.page.getByText('Check your e-mail: follow the link we sent to confirm the address, and the firm is ready.').waitFor();
    // The link arrives by e-mail (the SMTP sink that npm test starts); following it makes the firm and signs in.
    let link: string | undefined;
    for (let k = 0; k < 50 && !link; k++) {
      const messages = (await (await fetch(`${process.env.MAIL_API_URL}/messages?to=${encodeURIComponent(email)}`)).json()) as {
        subject: string;
        text: string;
      }[];
      link = /(http\S+confirm-registration\?token=[\w-]+)/.exec(messages.find((m) => m.subject === 'Confirm your Ampwright registration')?.text ?? '')?.[1];
      if (!link) await new Promise((r) => setTimeout(r, 200));
    }
    expect(link).toBeDefined();
    await s.page.goto(link!);
    await s.page.waitForURL(/\/members$/);
    await s.page.getByRole('table', { name: 'Members' }).getByText(email).waitFor();
    await expect.poll(() => s.page.getByTestId('firm-and-roles').textContent()).toBe('Quillon Power Studies · Owner');
  });

  it('keeps a client on the portal side', async () => {
    await s.page.goto(`${baseUrl()}/sign-in`);
    await signIn('client@kestrelridge.example', DEMO_PASSWORD);
    await s.page.waitForURL(/\/portal$/);
    const nav = s.page.getByRole('navigation', { name: 'Main' });
    await nav.getByRole('link', { name: 'Client portal' }).waitFor();
    expect(await nav.getByRole('link', { name: 'Projects' }).count()).toBe(0);
  });
});
