import { chromium, type Browser, type Page } from 'playwright-core';

/** Debian's Chromium, driven by playwright-core; no browser is downloaded. */
export async function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
}

export function baseUrl(): string {
  const url = process.env.E2E_BASE_URL;
  if (!url) throw new Error('E2E_BASE_URL is not set: run the end-to-end tests through `npm test`');
  return url;
}

/**
 * Collects errors the page logs, so a test can assert the page ran cleanly. The browser logs every
 * 401 response; a signed-out visitor's "who am I" gets one by design, so those are left out.
 */
export function collectPageErrors(page: Page): string[] {
  const errors: string[] = [];
  page.on('pageerror', (err) => errors.push(err.message));
  page.on('console', (msg) => {
    if (msg.type() === 'error' && !/status of 401/.test(msg.text())) errors.push(msg.text());
  });
  return errors;
}

/**
 * Registers the hooks of a browser test file: one browser for the file, a fresh context and page per
 * test (no cookies carried over). Read `session.page` and `session.errors` inside a test.
 */
export function useBrowserPage(hooks: {
  beforeAll: (fn: () => Promise<void>) => void;
  afterAll: (fn: () => Promise<void>) => void;
  beforeEach: (fn: () => Promise<void>) => void;
}) {
  const session = {} as { browser: Browser; context?: import('playwright-core').BrowserContext; page: Page; errors: string[] };
  hooks.beforeAll(async () => {
    session.browser = await launchBrowser();
  });
  hooks.afterAll(async () => {
    await session.browser?.close();
  });
  hooks.beforeEach(async () => {
    await session.context?.close();
    session.context = await session.browser.newContext();
    session.page = await session.context.newPage();
    session.errors = collectPageErrors(session.page);
  });
  return session;
}
