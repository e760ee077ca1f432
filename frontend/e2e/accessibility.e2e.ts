/**
 * Every page through axe-core (4.14.1, Deque's accessibility engine, run in the page as its own script):
 * no violation of impact "serious" or "critical" against WCAG 2.1 A and AA. Each page is checked signed in
 * as someone who may see it, at a desktop width and at a phone's (390 px), with its content loaded; at
 * both, the page must not be wider than the screen.
 */
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { baseUrl, useBrowserPage } from './support/browser';
import { seriousViolations } from './support/axe';
import { signIn } from './support/flows';

/** Opens a page and waits until its main heading is there (the page's own content has loaded). */
async function open(page: Page, path: string) {
  await page.goto(`${baseUrl()}${path}`);
  await page
    .getByRole('heading', { level: 1 })
    .first()
    .waitFor({ timeout: 10_000 })
    .catch(() => {
      throw new Error(`${path} shows no main heading`);
    });
  await page.waitForLoadState('networkidle');
}

describe('accessibility of every page (axe-core)', () => {
  const s = useBrowserPage({ beforeAll, afterAll, beforeEach });

  const check = async (paths: string[]) => {
    const found: string[] = [];
    for (const width of [1280, 390]) {
      await s.page.setViewportSize({ width, height: 900 });
      for (const path of paths) {
        await open(s.page, path);
        found.push(...(await seriousViolations(s.page)).map((v) => `${path} at ${width} px: ${v}`));
        // Nothing runs off the side: the page never scrolls sideways (wide cells and tables scroll within themselves).
        const wide = await s.page.evaluate(() => {
          const over = document.documentElement.scrollWidth - window.innerWidth;
          if (over <= 0) return null;
          // The deepest elements that reach past the screen's edge, to say where.
          const beyond = (e: Element) => e.getBoundingClientRect().right > window.innerWidth + 1;
          const clipped = (e: Element) => {
            for (let a = e.parentElement; a; a = a.parentElement) if (getComputedStyle(a).overflowX !== 'visible' && !beyond(a)) return true;
            return false;
          };
          const past = [...document.querySelectorAll<HTMLElement>('main *, header *')].filter((e) => beyond(e) && !clipped(e) && ![...e.children].some(beyond));
          return `${over} px, at ${past
            .slice(0, 3)
            .map(
              (e) =>
                `${e.tagName.toLowerCase()}${e.getAttribute('aria-label') ? `[${e.getAttribute('aria-label')}]` : ''} "${(e.textContent ?? '').slice(0, 40)}"`,
            )
            .join('; ')}`;
        });
        if (wide) found.push(`${path} at ${width} px: the page is wider than the screen by ${wide}`);
      }
    }
    expect(found).toEqual([]);
  };

  it('has no serious or critical violation on the public pages', async () => {
    await check([
      '/sign-in',
      '/register',
      '/forgot-password',
      '/reset-password?token=x',
      '/accept-invitation?token=x',
      '/verify',
      '/no-access',
      '/nothing/here',
    ]);
  });

  it("has no serious or critical violation on an engineer's pages: projects, a project, a sheet, its history, notifications, profile", async () => {
    await signIn(s.page, 'engineer@northfold.example', '/projects');
    await s.page.waitForURL(/\/projects$/);
    await s.page
      .getByRole('link', { name: /NE-2417/ })
      .first()
      .click();
    await s.page.waitForURL(/\/projects\/[0-9a-f-]{36}$/);
    const project = new URL(s.page.url()).pathname;
    await s.page
      .getByRole('link', { name: /C-10\d/ })
      .first()
      .click();
    await s.page.waitForURL(/\/sheets\/[0-9a-f-]{36}$/);
    const sheet = new URL(s.page.url()).pathname;
    await check(['/projects', project, sheet, `${sheet}/history`, '/notifications', '/profile']);
  });

  it("has no serious or critical violation on the owner's members page and the client's portal", async () => {
    await signIn(s.page, 'owner@northfold.example', '/members');
    await s.page.waitForURL(/\/members$/);
    await check(['/members']);
    await s.page.context().clearCookies();
    await signIn(s.page, 'client@kestrelridge.example', '/portal');
    await s.page.waitForURL(/\/portal$/);
    await check(['/portal']);
  });

  it('collapses the header into a menu on a phone-sized screen, which opens the pages and the account', async () => {
    await s.page.setViewportSize({ width: 390, height: 844 });
    await signIn(s.page, 'engineer@northfold.example', '/projects');
    await s.page.waitForURL(/\/projects$/);
    expect(await s.page.getByRole('navigation', { name: 'Main' }).count()).toBe(0);
    await s.page.getByRole('button', { name: 'Menu' }).click();
    const menu = s.page.getByRole('dialog', { name: 'Menu' });
    await menu.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Verify a package' }).click();
    await s.page.waitForURL(/\/verify$/);
    await menu.waitFor({ state: 'hidden' });
    await s.page.getByRole('button', { name: 'Menu' }).click();
    await menu.getByTestId('account').getByText('Sign out').waitFor();
    expect(s.errors).toEqual([]);
  });
});
