import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { baseUrl, collectPageErrors, launchBrowser } from './support/browser';

const DEMO_PASSWORD = 'Ampwright-demo-1';

describe('accounts in a real browser', () => {
  let browser: Browser;
  let context: BrowserContext;
  let page: Page;

  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });
  beforeEach(async () => {
    await context?.close();
    context = await browser.newContext();
    page = await context.newPage();
    collectPageErrors(page);
  });

  async function signIn(email: string, password: string) {
    await page.getByLabel('E-mail address').fill(email);
    await page.getByLabel('Password').fill(password);
    await page.getByRole('button', { name: 'Sign in' }).click();
  }

  it('sends a deep link to sign in, then back to it, with firm and roles in the shell; signing out ends the session', async () => {
    await page.goto(`${baseUrl()}/projects/p1/sheets/s1`);
    await page.waitForURL(/\/sign-in\?next=/);
    await signIn('engineer@northfold.example', DEMO_PASSWORD);
    await page.waitForURL(/\/projects\/p1\/sheets\/s1$/);
    await expect.poll(() => page.getByTestId('firm-and-roles').textContent()).toBe('Northfold Engineering · Engineer');
    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.waitForURL(/\/sign-in$/);
    await page.goto(`${baseUrl()}/projects`);
    await page.waitForURL(/\/sign-in\?next=/);
  });

  it('says so, beside nothing else, when the password is wrong', async () => {
    await page.goto(`${baseUrl()}/sign-in`);
    await signIn('approver@northfold.example', 'not the password');
    expect(await page.getByRole('alert').textContent()).toBe('The e-mail address or the password is not right.');
  });

  it('shows field messages before sending a form that is not complete', async () => {
    await page.goto(`${baseUrl()}/register`);
    await page.getByLabel('Firm name').fill('Quillon Power Studies');
    await page.getByLabel('Password').fill('short');
    await page.getByRole('button', { name: 'Register' }).click();
    expect(await page.getByText('Use at least 12 characters').count()).toBe(1);
    expect(await page.getByText('Enter your name').count()).toBe(1);
  });

  it('registers a firm and lets its owner see the members page', async () => {
    const email = `owner-${Date.now()}@quillon.example`;
    await page.goto(`${baseUrl()}/register`);
    await page.getByLabel('Firm name').fill('Quillon Power Studies');
    await page.getByLabel('Your name').fill('Rhiannon Vale');
    await page.getByLabel('E-mail address').fill(email);
    await page.getByLabel('Password').fill('a long enough passphrase');
    await page.getByRole('button', { name: 'Register' }).click();
    await page.waitForURL(/\/members$/);
    await page.getByRole('table', { name: 'Members' }).getByText(email).waitFor();
    expect(await page.getByTestId('firm-and-roles').textContent()).toBe('Quillon Power Studies · Owner');
  });

  it('keeps a client on the portal side', async () => {
    await page.goto(`${baseUrl()}/sign-in`);
    await signIn('client@kestrelridge.example', DEMO_PASSWORD);
    await page.waitForURL(/\/portal$/);
    const nav = page.getByRole('navigation', { name: 'Main' });
    expect(await nav.getByRole('link', { name: 'Projects' }).count()).toBe(0);
  });
});
