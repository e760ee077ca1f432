import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { baseUrl, useBrowserPage } from './support/browser';

describe('the app shell in a real browser', () => {
  const s = useBrowserPage({ beforeAll, afterAll, beforeEach });

  it('serves the shell with the server reported ready', async () => {
    await s.page.goto(`${baseUrl()}/`);
    await s.page.getByRole('navigation', { name: 'Main' }).waitFor();
    await expect.poll(() => s.page.getByTestId('service-status').textContent()).toBe('Server ready');
    expect(s.errors).toEqual([]);
  });

  it('opens a client route directly (the server falls back to the app)', async () => {
    const res = await s.page.goto(`${baseUrl()}/verify`);
    expect(res?.status()).toBe(200);
    await expect.poll(() => s.page.getByRole('heading', { level: 1 }).textContent()).toBe('Verify a package');
  });

  it('caches the hashed assets a year as immutable and the page never, and serves no source map', async () => {
    const page = await fetch(`${baseUrl()}/`);
    expect(page.headers.get('cache-control')).toBe('no-cache');
    const route = await fetch(`${baseUrl()}/projects/p-1`);
    expect([route.status, route.headers.get('cache-control')]).toEqual([200, 'no-cache']);
    const entry = /<script[^>]*type="module"[^>]*src="([^"]+)"/.exec(await page.text())![1];
    const asset = await fetch(`${baseUrl()}${entry}`);
    expect([asset.status, asset.headers.get('cache-control')]).toEqual([200, 'public, max-age=31536000, immutable']);
    expect((await fetch(`${baseUrl()}${entry}.map`)).status).toBe(404);
  });

  it('loads a page that is not the first one when it is first visited (its own chunk)', async () => {
    const scripts: string[] = [];
    s.page.on('request', (r) => r.resourceType() === 'script' && scripts.push(new URL(r.url()).pathname));
    await s.page.goto(`${baseUrl()}/`);
    await s.page.getByRole('navigation', { name: 'Main' }).waitFor();
    const first = scripts.length;
    await s.page.goto(`${baseUrl()}/verify`);
    await expect.poll(() => s.page.getByRole('heading', { level: 1 }).textContent()).toBe('Verify a package');
    expect(scripts.slice(first).some((path) => /\/assets\/verify-[\w-]+\.js$/.test(path))).toBe(true);
  });

  it('moves between pages through the navigation', async () => {
    await s.page.goto(`${baseUrl()}/`);
    await s.page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Verify a package' }).click();
    await s.page.waitForURL(/\/verify$/);
    await expect.poll(() => s.page.getByRole('heading', { level: 1 }).textContent()).toBe('Verify a package');
  });

  it('shows the not-found page for an unknown address', async () => {
    await s.page.goto(`${baseUrl()}/nothing/here`);
    await expect.poll(() => s.page.getByRole('heading', { level: 1 }).textContent()).toBe('No page at this address');
  });

  it('uses the fonts shipped with the app, fetched from our own origin only', async () => {
    const fontRequests: string[] = [];
    s.page.on('request', (req) => {
      if (req.resourceType() === 'font') fontRequests.push(req.url());
    });
    await s.page.goto(`${baseUrl()}/`);
    await s.page.getByRole('navigation', { name: 'Main' }).waitFor();
    await s.page.evaluate(() => document.fonts.ready);
    const family = await s.page.evaluate(() => getComputedStyle(document.body).fontFamily);
    expect(family).toContain('IBM Plex Sans');
    expect(await s.page.evaluate(() => document.fonts.check('16px "IBM Plex Sans"'))).toBe(true);
    expect(fontRequests.length).toBeGreaterThan(0);
    for (const url of fontRequests) expect(url.startsWith(baseUrl())).toBe(true);
  });

  it('keeps /api answers as JSON, never the web app', async () => {
    const res = await s.page.goto(`${baseUrl()}/api/no-such-route`);
    expect(res?.status()).toBe(404);
    expect(res?.headers()['content-type']).toContain('application/json');
  });
});
