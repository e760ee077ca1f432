import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { useBrowserPage } from './support/browser';
import { newSheetFromTemplate, signIn } from './support/flows';

async function newRlcSheet(page: Page) {
  await signIn(page, 'engineer@northfold.example', '/projects');
  await page.waitForURL(/\/projects$/);
  await newSheetFromTemplate(page, 'Series RLC branch: steady-state current at the supply frequency', 'C-910');
}

const text = (page: Page, testId: string) => page.getByTestId(testId).first().textContent();

describe('the sheet editor in a real browser', () => {
  const s = useBrowserPage({ beforeAll, afterAll, beforeEach });

  it('edits an input and shows the results update; flags a failing check; imports a CSV and an attachment; keeps it all after a reload', async () => {
    const { page } = s;
    await newRlcSheet(page);
    await expect.poll(() => text(page, 'result-Z')).toContain('13.05');
    const phiBefore = await text(page, 'result-phi');
    const lagBefore = await text(page, 'result-t_lag');
    // The sheet shows its impedance triangle and a sweep chart drawn as SVG.
    expect(await page.getByRole('figure', { name: 'Impedance triangle' }).count()).toBeGreaterThan(0);
    expect(await page.getByRole('figure', { name: 'Frequency response' }).count()).toBe(1);

    // Change R from 12 to 24 ohm: Z = sqrt(24² + 5.115²) = 24.54 ohm (the same identity the engine's tests check).
    const inputs = page.getByRole('region', { name: 'Cell 2: Calculation' });
    await inputs.getByRole('button', { name: 'Edit' }).click();
    const editor = page.getByRole('textbox', { name: 'Cell 2 source' });
    await editor.click();
    await page.keyboard.press('Control+a');
    const source = (await page.evaluate(() => document.querySelector('[aria-label="Cell 2 source"]')?.textContent)) ?? '';
    expect(source).toContain('R = 12 ohm');
    await page.keyboard.insertText('R = 24 ohm\nL = 40 mH\nC = 180 uF\nf = 50 Hz\nE0 = 325 V\nw = 2 pi f');
    await expect.poll(() => text(page, 'result-Z'), { timeout: 10000 }).toContain('24.54');
    await expect.poll(() => text(page, 'result-phi')).not.toBe(phiBefore);
    expect(await text(page, 'result-t_lag')).not.toBe(lagBefore);
    await expect.poll(() => inputs.getByTestId('save-state').textContent()).toBe('Saved');
    // The save state is a live region, announced as it changes.
    await page.getByRole('status', { name: 'Cell 2: Saved' }).waitFor();

    // A check that fails is flagged.
    await page.getByRole('navigation', { name: 'Sheet tools' }).getByRole('button', { name: 'Add a cell at the end' }).click();
    await page.getByRole('menuitem', { name: 'Check' }).click();
    const condition = page.getByRole('textbox', { name: /Cell \d+ condition/ });
    await condition.waitFor();
    await condition.click();
    await page.keyboard.insertText('Z <= 20 ohm');
    await expect.poll(async () => (await page.getByTestId('check-outcome').allTextContents()).includes('Fail'), { timeout: 10000 }).toBe(true);

    // A CSV becomes a table cell; an attachment is uploaded and listed with its hash.
    await page
      .getByTestId('csv-input')
      .setInputFiles({ name: 'harmonics.csv', mimeType: 'text/csv', buffer: Buffer.from('h, I_h [A]\n1, 100\n5, 18\n7, 11\n') });
    await page.getByRole('grid', { name: 'Table' }).waitFor();
    await page
      .getByTestId('attachment-input')
      .setInputFiles({ name: 'site-note.txt', mimeType: 'text/plain', buffer: Buffer.from('Bank nameplate read on site.\n') });
    await page.getByRole('table', { name: 'Attachment list' }).getByText('site-note.txt').waitFor();

    // A file of the wrong type is refused and not listed.
    await page
      .getByTestId('attachment-input')
      .setInputFiles({ name: 'drawing.pdf', mimeType: 'application/pdf', buffer: Buffer.from('just text, not a PDF\n') });
    await expect.poll(() => page.getByRole('region', { name: 'Attachments' }).getByRole('alert').textContent()).toMatch(/drawing\.pdf was refused/);

    await page.reload();
    await expect.poll(() => text(page, 'result-Z')).toContain('24.54');
    expect(await page.getByTestId('check-outcome').allTextContents()).toContain('Fail');
    expect(await page.getByRole('grid', { name: 'Table' }).count()).toBe(1);
    await page.getByRole('table', { name: 'Attachment list' }).getByText('site-note.txt').waitFor();
    expect(await page.getByRole('table', { name: 'Attachment list' }).getByText('drawing.pdf').count()).toBe(0);
    // The browser logs the refused upload's 415 itself; nothing else may go wrong on the page.
    expect(s.errors.filter((e) => !/status of 415/.test(e))).toEqual([]);
  });

  it("shows an edit's results at once as a preview from the browser's engine, and the server's stored results once they come", async () => {
    const { page } = s;
    await newRlcSheet(page);
    await expect.poll(() => text(page, 'result-Z')).toContain('13.05');
    // The server's answer to the save is held back until the test lets it go: whatever shows before is the preview.
    let release!: () => void;
    const held = new Promise<void>((r) => (release = r));
    await page.route(/\/api\/sheets\/[^/]+\/cells\/[^/]+$/, async (route) => {
      if (route.request().method() === 'PATCH') await held;
      await route.continue();
    });
    const inputs = page.getByRole('region', { name: 'Cell 2: Calculation' });
    await inputs.getByRole('button', { name: 'Edit' }).click();
    await page.getByRole('textbox', { name: 'Cell 2 source' }).click();
    await page.keyboard.press('Control+a');
    await page.keyboard.insertText('R = 24 ohm\nL = 40 mH\nC = 180 uF\nf = 50 Hz\nE0 = 325 V\nw = 2 pi f');
    // Z = sqrt(24² + 5.115²) = 24.54 ohm, shown while the save is still on its way, and marked as a preview where it shows.
    await expect.poll(() => text(page, 'result-Z'), { timeout: 5000 }).toContain('24.54');
    const zCell = page
      .getByRole('region')
      .filter({ has: page.getByTestId('result-Z') })
      .first();
    expect(await zCell.getByTestId('preview-mark').count()).toBe(1);
    expect(await inputs.getByTestId('save-state').textContent()).not.toBe('Saved');
    // A mistake is underlined from the preview too, before any save.
    const mistake = '\nbad = 3 ohm + 2 H';
    await page.keyboard.insertText(mistake);
    await expect.poll(() => inputs.locator('.cm-lintRange-error').count(), { timeout: 5000 }).toBeGreaterThan(0);
    // Taken out key by key: an undo would also take back the edit above when both came within the editor's
    // grouping delay (CodeMirror joins changes less than 500 ms apart into one undo step).
    for (let k = 0; k < mistake.length; k++) await page.keyboard.press('Backspace');
    await expect.poll(() => inputs.locator('.cm-lintRange-error').count(), { timeout: 5000 }).toBe(0);

    release();
    await expect.poll(() => inputs.getByTestId('save-state').textContent(), { timeout: 10000 }).toBe('Saved');
    await expect.poll(() => page.getByTestId('preview-mark').count()).toBe(0);
    expect(await text(page, 'result-Z')).toContain('24.54');
    // The stored results agree with the preview: nothing to flag.
    expect(await page.getByTestId('preview-differs').count()).toBe(0);
    expect(s.errors).toEqual([]);
  });

  it('works from the keyboard with its own keys, each listed in the keyboard help', async () => {
    const { page } = s;
    await newRlcSheet(page);
    const cellTitles = () => page.locator('[data-cell-id]').evaluateAll((cells) => cells.map((c) => c.getAttribute('aria-label')));
    await page.getByRole('region', { name: 'Cell 2: Calculation' }).waitFor();
    const before = await cellTitles();
    // The help opens from the sheet's toolbar and by F1, and lists every key.
    await page.getByRole('button', { name: 'Keys' }).click();
    const help = page.getByRole('dialog', { name: 'Keys of the sheet' });
    await help.waitFor();
    for (const key of ['Ctrl+S', 'Ctrl+↓', 'Ctrl+↑', 'Ctrl+Shift+↓', 'Ctrl+Shift+↑', 'Ctrl+Shift+Space', 'F1'])
      await help.getByText(key, { exact: true }).waitFor();
    await page.keyboard.press('Escape');
    await help.waitFor({ state: 'hidden' });

    // In cell 2's source: Ctrl+S saves now; Ctrl+↓ goes to cell 3; Ctrl+Shift+↑ moves cell 3 up.
    await page.getByRole('region', { name: 'Cell 2: Calculation' }).getByRole('button', { name: 'Edit' }).click();
    const source = page.getByRole('textbox', { name: 'Cell 2 source' });
    await source.click();
    await page.keyboard.press('End');
    await page.keyboard.insertText(' # typed');
    await page.keyboard.press('Control+s');
    await page.getByRole('status', { name: 'Cell 2: Saved' }).waitFor();
    await page.keyboard.press('Control+ArrowDown');
    const third = page.locator('[data-cell-id]').nth(2);
    const thirdId = await third.getAttribute('data-cell-id');
    await expect.poll(() => third.evaluate((c) => c.contains(document.activeElement) || c.querySelector('.cm-editor') !== null)).toBe(true);
    await third.locator('.cm-content, input').first().click();
    await page.keyboard.press('Control+Shift+ArrowUp');
    await expect.poll(async () => page.locator('[data-cell-id]').nth(1).getAttribute('data-cell-id')).toBe(thirdId);

    // Ctrl+Shift+Space starts a new calc cell below, opened for typing.
    const count = (await cellTitles()).length;
    await page.keyboard.press('Control+Shift+Space');
    await expect.poll(async () => (await cellTitles()).length).toBe(count + 1);
    await page.getByRole('textbox', { name: 'Cell 3 source' }).waitFor();

    // F1 opens the help from inside the editor too; the browser's own page is never asked for.
    await page.keyboard.press('F1');
    await help.waitFor();
    await page.keyboard.press('Escape');
    expect(before.length).toBe(count);
    expect(s.errors).toEqual([]);
  });

  it('reads a chart under the pointer with units, zooms to a dragged range and back, and exports the series as CSV', async () => {
    const { page } = s;
    await newRlcSheet(page);
    const figure = page.getByRole('figure', { name: 'Frequency response' });
    await figure.waitFor();
    await figure.scrollIntoViewIfNeeded();
    const readout = page.getByTestId('chart-readout');
    // Over the middle of the plot area: the swept frequency and each series, with units. The pointer is
    // moved again on each try, where the figure is then (the page may still be settling around it).
    await expect
      .poll(async () => {
        const at = (await figure.boundingBox())!;
        await page.mouse.move(at.x + at.width * 0.55, at.y + at.height * 0.3);
        return readout.textContent();
      })
      .toMatch(/^\w+ = [\d.e+-]+ Hz · /);
    const box = (await figure.boundingBox())!;
    const before = await readout.textContent();
    // A drag across the left half zooms to it; the axis now spans that range.
    await page.mouse.move(box.x + box.width * 0.2, box.y + box.height * 0.3);
    await page.mouse.down();
    await page.mouse.move(box.x + box.width * 0.5, box.y + box.height * 0.3, { steps: 5 });
    await page.mouse.up();
    await page.getByTestId('chart-range').waitFor();
    expect(await page.getByTestId('chart-range').textContent()).toMatch(/^\w+ from [\d.e+-]+ Hz to [\d.e+-]+ Hz$/);
    await page.mouse.move(box.x + box.width * 0.55, box.y + box.height * 0.3);
    await expect.poll(() => readout.textContent()).not.toBe(before);
    await page.getByRole('button', { name: 'Whole range' }).click();
    await page.getByTestId('chart-range').waitFor({ state: 'hidden' });
    // By keyboard: the chart is a slider over its points; + zooms in around the point read, the Pan buttons
    // move the range, − zooms out, Escape shows the whole range.
    const slider = page.getByRole('slider', { name: 'Frequency response: point read' });
    await slider.focus();
    await page.keyboard.press('Home');
    await expect.poll(() => readout.textContent()).toMatch(/^\w+ = [\d.e+-]+ Hz · /);
    const first = await readout.textContent();
    await page.keyboard.press('Shift+ArrowRight');
    await expect.poll(() => readout.textContent()).not.toBe(first);
    expect(await slider.getAttribute('aria-valuenow')).toBe('10');
    await page.keyboard.press('+');
    const zoomed = await page.getByTestId('chart-range').textContent();
    await page.getByRole('button', { name: 'Pan to higher values' }).click();
    await expect.poll(() => page.getByTestId('chart-range').textContent()).not.toBe(zoomed);
    await slider.focus();
    await page.keyboard.press('Escape');
    await page.getByTestId('chart-range').waitFor({ state: 'hidden' });
    // The series plotted, as CSV with a unit in each column's name.
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Export as CSV' }).click()]);
    const csv = await (await download.createReadStream()).toArray();
    const lines = Buffer.concat(csv).toString('utf8').trim().split('\n');
    expect(lines[0]).toMatch(/^"\w+ \[Hz\]",/);
    expect(lines.length).toBeGreaterThan(20);
    expect(lines[1].split(',').every((v) => Number.isFinite(Number(v)))).toBe(true);
    expect(s.errors).toEqual([]);
  });

  it('deletes a cell and restores it, and underlines an error in the source', async () => {
    const { page } = s;
    await newRlcSheet(page);
    const cells = page.locator('section[aria-label^="Cell "]');
    await expect.poll(() => cells.count()).toBeGreaterThan(3);
    const count = await cells.count();
    const fourth = page.getByRole('region', { name: 'Cell 4: Calculation' });
    await fourth.getByRole('button', { name: 'Delete' }).click();
    await expect.poll(() => cells.count()).toBe(count - 1);
    await page.getByRole('button', { name: 'Restore the last deleted cell' }).click();
    await expect.poll(() => cells.count()).toBe(count);
    await page.getByRole('region', { name: 'Cell 4: Calculation' }).getByTestId('result-I0_f').waitFor();

    await page.getByRole('region', { name: 'Cell 4: Calculation' }).getByRole('button', { name: 'Edit' }).click();
    await page.getByRole('textbox', { name: 'Cell 4 source' }).click();
    await page.keyboard.press('Control+a');
    await page.keyboard.insertText('bad = 3 ohm + 2 A');
    await expect.poll(() => page.getByTestId('cell-error').first().textContent(), { timeout: 10000 }).toMatch(/Line 1/);
    expect(await page.locator('.cm-lintRange-error').count()).toBeGreaterThan(0);
  });

  it('stays usable with a sheet of 500 cells: an edit far down the sheet is saved and evaluated', async () => {
    const { page } = s;
    await newRlcSheet(page);
    const projectId = /\/projects\/([0-9a-f-]{36})\//.exec(page.url())![1];
    // 250 pairs of a calc cell and a check on it, imported as a sheet file through the API.
    const cells = Array.from({ length: 250 }, (_, k) => [
      { kind: 'calc', source: `R_${k} = ${k + 1} ohm\nI_${k} = 10 V / R_${k} to mA` },
      { kind: 'check', condition: `I_${k} <= 20 A`, basis: 'common practice' },
    ]).flat();
    const id = await page.evaluate(
      async ({ projectId, cells }) => {
        const me = await (await fetch('/api/auth/me')).json();
        const res = await fetch(`/api/projects/${projectId}/sheets`, {
          method: 'POST',
          headers: { 'Content-Type': 'application/json', 'x-ampwright-csrf': me.csrfToken },
          body: JSON.stringify({ number: 'C-500', sheet: { format: 'ampwright.sheet/1', title: 'Five hundred cells', cells } }),
        });
        return (await res.json()).id as string;
      },
      { projectId, cells },
    );
    await page.goto(`${page.url().replace(/sheets\/.*$/, '')}sheets/${id}`);
    const last = page.getByRole('region', { name: 'Cell 499: Calculation' });
    await last.scrollIntoViewIfNeeded();
    await expect.poll(() => last.getByTestId('result-I_249').textContent(), { timeout: 20000 }).toContain('40');
    await last.getByRole('button', { name: 'Edit' }).click();
    await page.getByRole('textbox', { name: 'Cell 499 source' }).click();
    await page.keyboard.press('Control+a');
    await page.keyboard.insertText('R_249 = 500 ohm\nI_249 = 10 V / R_249 to mA');
    await expect.poll(() => last.getByTestId('result-I_249').textContent(), { timeout: 20000 }).toContain('20');
    expect(await page.locator('section[aria-label^="Cell "]').count()).toBe(500);
  });
});
