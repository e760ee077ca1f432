import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import type { Locator, Page } from 'playwright-core';
import { useBrowserPage } from './support/browser';
import { seriousViolations } from './support/axe';
import { newSheetFromTemplate, signIn } from './support/flows';

const ROWS = 20_000;

/** A spreadsheet's export in a decimal-comma locale: semicolons between values, commas in numbers. */
function bigCsv(): Buffer {
  const lines = ['h;I_h [A]'];
  for (let i = 1; i <= ROWS; i++) lines.push(`${i};${(1000 / i).toFixed(3).replace('.', ',')}`);
  return Buffer.from(`${lines.join('\r\n')}\r\n`);
}

/** The values the grid shows in its column `column` (1 = the first after the row numbers), by row number (only the rows drawn). */
async function shown(grid: Locator, column: number): Promise<Map<number, string>> {
  const cells = await grid
    .locator(`[role="row"] > [role="gridcell"][aria-colindex="${column + 1}"]`)
    .evaluateAll((els) => els.map((el) => [Number(el.parentElement?.getAttribute('aria-rowindex')) - 1, el.textContent ?? ''] as const));
  return new Map(cells);
}

const H = 1;
const I_H = 2;

async function paste(page: Page, grid: Locator, text: string) {
  await grid.evaluate((el, t) => {
    const data = new DataTransfer();
    data.setData('text/plain', t);
    el.dispatchEvent(new ClipboardEvent('paste', { clipboardData: data, bubbles: true, cancelable: true }));
  }, text);
}

describe('a table of 20 000 rows in a real browser', () => {
  const s = useBrowserPage({ beforeAll, afterAll, beforeEach });

  it('imports a decimal-comma CSV and says what it detected; draws only the rows in view; edits by keyboard and by a pasted block; keeps it after a reload', async () => {
    const { page } = s;
    await signIn(page, 'engineer@northfold.example', '/projects');
    await page.waitForURL(/\/projects$/);
    await newSheetFromTemplate(page, 'Series RLC branch: steady-state current at the supply frequency', 'C-920');

    await page.getByTestId('csv-input').setInputFiles({ name: 'spectrum.csv', mimeType: 'text/csv', buffer: bigCsv() });
    await page
      .getByText('spectrum.csv imported as a table: 20,000 rows × 2 columns, values separated by semicolons, decimal comma.')
      .waitFor({ timeout: 30000 });

    // Read: a grid of 20 000 rows of which only those in view are in the page.
    const region = page.getByRole('region', { name: /^Cell \d+: Table$/ });
    const view = region.getByRole('grid', { name: 'Table' });
    await view.waitFor();
    expect(await view.getAttribute('aria-rowcount')).toBe(String(ROWS + 1));
    expect(await view.getByRole('row').count()).toBeLessThan(60);
    expect(await seriousViolations(page)).toEqual([]);
    expect((await shown(view, I_H)).get(2)).toBe('500');

    // Edit: the grid becomes editable; Ctrl+End goes to the last row, drawn on arrival.
    await region.getByRole('button', { name: 'Edit' }).click();
    const grid = region.getByRole('grid', { name: /^Cell \d+ table$/ });
    await grid.waitFor();
    await grid.focus();
    await page.keyboard.press('Control+End');
    await page.keyboard.press('End');
    await expect.poll(async () => (await shown(grid, I_H)).get(ROWS)).toBe('0.05');
    expect(await grid.getByRole('row').count()).toBeLessThan(60);
    expect(await seriousViolations(page)).toEqual([]);
    // Typing over a value edits it; a decimal comma is read as one; Enter keeps it and goes down (here: stays on the last row).
    await page.keyboard.type('7,5');
    await page.keyboard.press('Enter');
    await expect.poll(async () => (await shown(grid, I_H)).get(ROWS)).toBe('7.5');
    // F2 edits the value as it is; Escape leaves it unchanged.
    await page.keyboard.press('ArrowUp');
    await page.keyboard.press('F2');
    await page.keyboard.type('99');
    await page.keyboard.press('Escape');
    expect((await shown(grid, I_H)).get(ROWS - 1)).toBe('0.05');

    // A block copied from a spreadsheet, pasted at the first row: two rows by two columns, tabs and CRLF.
    await page.keyboard.press('Control+Home');
    await page.keyboard.press('Home');
    await expect.poll(async () => (await shown(grid, H)).get(1)).toBe('1');
    await paste(page, grid, '0,5\t2000\r\n1,5\t666,7\r\n');
    await expect.poll(async () => (await shown(grid, I_H)).get(2)).toBe('666.7');
    expect((await shown(grid, H)).get(1)).toBe('0.5');
    await region.getByText('Pasted 2 × 2 values at row 1, h, read with a decimal comma.').waitFor();
    // Delete empties the selection (extended with Shift+arrow): here both values of row 3.
    await page.keyboard.press('Home');
    await page.keyboard.press('ArrowDown');
    await page.keyboard.press('Shift+ArrowRight');
    await page.keyboard.press('Delete');
    await expect.poll(async () => [(await shown(grid, H)).get(3), (await shown(grid, I_H)).get(3)]).toEqual(['', '']);
    // Enter edits, Tab keeps the value and goes right, where typing starts the next.
    await page.keyboard.press('Home');
    await page.keyboard.press('Enter');
    await page.keyboard.type('3');
    await page.keyboard.press('Tab');
    await page.keyboard.type('333,3');
    await page.keyboard.press('Enter');
    await expect.poll(() => region.getByTestId('save-state').textContent(), { timeout: 30000 }).toBe('Saved');

    await page.reload();
    const again = page.getByRole('region', { name: /^Cell \d+: Table$/ }).getByRole('grid', { name: 'Table' });
    await again.waitFor();
    const first = await shown(again, I_H);
    expect([first.get(1), first.get(2), first.get(3)]).toEqual(['2000', '666.7', '333.3']);
    expect((await shown(again, H)).get(1)).toBe('0.5');
    await again.focus();
    await page.keyboard.press('Control+End');
    await expect.poll(async () => (await shown(again, I_H)).get(ROWS)).toBe('7.5');
    expect(s.errors).toEqual([]);
  });
});
