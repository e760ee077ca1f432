import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { useBrowserPage } from './support/browser';
import { newSheetFromTemplate, signIn } from './support/flows';

async function pageFor(browser: Browser, email: string, path: string): Promise<Page> {
  const page = await (await browser.newContext()).newPage();
  await signIn(page, email, path);
  await page.waitForURL((u) => u.pathname === path);
  return page;
}

const cell = (page: Page, n: number) => page.locator(`section[aria-label^="Cell ${n}:"]`);

describe('independent checking and revisions in a real browser', () => {
  const s = useBrowserPage({ beforeAll, afterAll, beforeEach });

  it('check asked, two queries raised, answered and closed, passed, issued as A; next revision diffed against A', async () => {
    const { page, browser } = s;
    // The engineer writes a sheet and asks the demo checker and approver.
    await signIn(page, 'engineer@northfold.example', '/projects');
    await page.waitForURL(/\/projects$/);
    await newSheetFromTemplate(page, 'Series RLC branch: steady-state current at the supply frequency', 'C-920');
    const sheetPath = new URL(page.url()).pathname;
    await page.getByRole('button', { name: 'Ask for a check' }).click();
    await page.getByLabel('Checker').click();
    await page.getByRole('option', { name: 'Priya Okonkwo' }).click();
    await page.getByLabel('Approver (optional)').click();
    await page.getByRole('option', { name: 'Hal Vermeulen' }).click();
    await page.getByRole('button', { name: 'Send for checking' }).click();
    await expect.poll(() => page.getByTestId('sheet-state').textContent(), { timeout: 15_000 }).toBe('With the checker');

    // The checker raises two queries.
    const checker = await pageFor(browser, 'checker@northfold.example', sheetPath);
    for (const [n, text] of [
      [2, 'Where does L = 40 mH come from?'],
      [3, 'Say why the delay angle is negative.'],
    ] as const) {
      await cell(checker, n).getByRole('button', { name: 'Raise a query' }).click();
      await cell(checker, n).getByLabel('Query').fill(text);
      await cell(checker, n).getByRole('button', { name: 'Raise', exact: true }).click();
      await cell(checker, n).getByText(text).waitFor();
    }
    await expect.poll(() => checker.getByTestId('open-queries').textContent()).toBe('2 open queries');
    expect(await checker.getByRole('button', { name: 'Pass the check' }).isDisabled()).toBe(true);

    // The engineer answers both and edits a cell.
    await page.reload();
    for (const n of [2, 3]) {
      await cell(page, n).getByLabel('Answer').fill(`Answered for cell ${n}.`);
      await cell(page, n).getByRole('button', { name: 'Send' }).click();
      await cell(page, n).getByText(`Answered for cell ${n}.`).waitFor();
    }
    await cell(page, 2).getByRole('button', { name: 'Edit' }).click();
    await page.getByRole('textbox', { name: 'Cell 2 source' }).click();
    await page.keyboard.press('Control+a');
    await page.keyboard.insertText(
      'R = 12 ohm                # branch resistance\nL = 40 mH                 # series inductance (reactor datasheet)\nC = 180 uF                # series capacitance\nf = 50 Hz                 # supply frequency\nE0 = 325 V                # source amplitude (230 V rms)\nw = 2 pi f                # angular frequency',
    );
    await expect.poll(() => cell(page, 2).getByTestId('save-state').textContent(), { timeout: 10000 }).toBe('Saved');

    // The checker closes both and passes the check.
    await checker.reload();
    for (const n of [2, 3]) {
      await cell(checker, n).getByRole('button', { name: 'Close the query' }).click();
      await expect.poll(() => cell(checker, n).getByTestId('query-status').textContent()).toBe('Closed');
    }
    await checker.getByRole('button', { name: 'Pass the check' }).click();
    await expect.poll(() => checker.getByTestId('sheet-state').textContent(), { timeout: 15_000 }).toBe('Checked');

    // The approver approves and issues revision A.
    const approver = await pageFor(browser, 'approver@northfold.example', sheetPath);
    await approver.getByRole('button', { name: 'Approve' }).click();
    await approver.getByRole('button', { name: 'Issue revision A' }).click();
    await expect.poll(() => approver.getByTestId('sheet-state').textContent(), { timeout: 20_000 }).toBe('Issued');

    // The engineer starts revision B and changes R; the diff shows R and what follows from it.
    await page.reload();
    await page.getByRole('button', { name: 'Start the next revision' }).click();
    await expect.poll(() => page.getByTestId('sheet-state').textContent(), { timeout: 15_000 }).toBe('Being prepared');
    await cell(page, 2).getByRole('button', { name: 'Edit' }).click();
    await page.getByRole('textbox', { name: 'Cell 2 source' }).click();
    await page.keyboard.press('Control+a');
    await page.keyboard.insertText('R = 24 ohm\nL = 40 mH\nC = 180 uF\nf = 50 Hz\nE0 = 325 V\nw = 2 pi f');
    await expect.poll(() => page.getByTestId('result-Z').first().textContent(), { timeout: 10000 }).toContain('24.54');
    await page.getByRole('link', { name: 'History and revisions' }).click();
    await page.getByRole('table', { name: 'Revisions' }).getByText('Hal Vermeulen').waitFor();
    const diff = page.getByRole('region', { name: 'Differences' });
    await diff.getByTestId('diff-input').first().waitFor();
    expect(await diff.getByTestId('diff-input').first().textContent()).toContain('R = 24 ohm');
    for (const name of ['R', 'Z', 'I0', 'phi', 't_lag', 'pf']) expect(await diff.getByTestId(`diff-result-${name}`).count(), name).toBeGreaterThan(0);
    const trail = await page.getByRole('region', { name: 'Audit trail' }).textContent();
    for (const words of [
      'asked for a check',
      'raised a query',
      'closed a query',
      'passed the check',
      'approved the sheet',
      'issued a revision A',
      'started the next revision',
    ])
      expect(trail).toContain(words);
  });
});
