import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { baseUrl, collectPageErrors, launchBrowser } from './support/browser';

describe('the app shell in a real browser', () => {
  let browser: Browser;
  let context: BrowserContext;
  let page: Page;
  let errors: string[];

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
    errors = collectPageErrors(page);
  });

  it('serves the shell with the server reported ready', async () => {
    await page.goto(`${baseUrl()}/`);
    await page.getByRole('navigation', { name: 'Main' }).waitFor();
    await expect.poll(() => page.getByTestId('service-status').textContent()).toBe('Server ready');
    expect(errors).toEqual([]);
  });

  it('opens a client route directly (the server falls back to the app)', async () => {
    const res = await page.goto(`${baseUrl()}/verify`);
    expect(res?.status()).toBe(200);
    expect(await page.getByRole('heading', { level: 1 }).textContent()).toBe('Verify a package');
  });

  it('moves between pages through the navigation', async () => {
    await page.goto(`${baseUrl()}/`);
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Verify a package' }).click();
    await page.waitForURL(/\/verify$/);
    expect(await page.getByRole('heading', { level: 1 }).textContent()).toBe('Verify a package');
  });

  it('shows the not-found page for an unknown address', async () => {
    await page.goto(`${baseUrl()}/nothing/here`);
    expect(await page.getByRole('heading', { level: 1 }).textContent()).toBe('No page at this address');
  });

  it('uses the fonts shipped with the app, fetched from our own origin only', async () => {
    const fontRequests: string[] = [];
    page.on('request', (req) => {
      if (req.resourceType() === 'font') fontRequests.push(req.url());
    });
    await page.goto(`${baseUrl()}/`);
    await page.getByRole('navigation', { name: 'Main' }).waitFor();
    await page.evaluate(() => document.fonts.ready);
    const family = await page.evaluate(() => getComputedStyle(document.body).fontFamily);
    expect(family).toContain('IBM Plex Sans');
    expect(await page.evaluate(() => document.fonts.check('16px "IBM Plex Sans"'))).toBe(true);
    expect(fontRequests.length).toBeGreaterThan(0);
    for (const url of fontRequests) expect(url.startsWith(baseUrl())).toBe(true);
  });

  it('keeps /api answers as JSON, never the web app', async () => {
    const res = await page.goto(`${baseUrl()}/api/no-such-route`);
    expect(res?.status()).toBe(404);
    expect(res?.headers()['content-type']).toContain('application/json');
  });
});
