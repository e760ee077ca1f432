import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { useBrowserPage } from './support/browser';
import { newSheetFromTemplate, signIn } from './support/flows';

/** Signs in as the second engineer (the first signs in often across the other files) and starts a sheet from a template. */
async function asEngineer2(page: Page, template: string, sheetNumber: string) {
  await signIn(page, 'engineer2@northfold.example', '/projects');
  await page.waitForURL(/\/projects$/);
  await page.getByRole('table', { name: 'Projects' }).getByText('NE-2417').waitFor();
  await newSheetFromTemplate(page, template, sheetNumber);
}

describe('projects and sheets in a real browser', () => {
  const s = useBrowserPage({ beforeAll, afterAll, beforeEach });

  it('creates a project and a sheet from the series RLC template, and shows its typeset results', async () => {
    const { page } = s;
    await asEngineer2(page, 'Series RLC branch: steady-state current at the supply frequency', 'C-900');
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe('Series RLC branch: steady-state current at the supply frequency');
    await expect.poll(() => page.getByTestId('result-Z').first().textContent()).toContain('13.05');
    expect(await page.getByTestId('check-outcome').first().textContent()).toBe('Pass');
    expect(await page.getByRole('note', { name: 'Caution' }).count()).toBe(1);

    // The angular frequency is shown in rad/s, and the note's maths is typeset (KaTeX), not shown as TeX.
    expect(await page.getByTestId('result-w').first().textContent()).toContain('rad/s');
    const note = page.getByTestId('note-text').first();
    expect(await note.locator('.katex').count()).toBeGreaterThanOrEqual(3);
    // Outside the typeset maths (whose MathML carries its TeX for screen readers) no TeX is left.
    const prose = await note.evaluate((el) => {
      const copy = el.cloneNode(true) as HTMLElement;
      copy.querySelectorAll('.katex').forEach((k) => k.remove());
      return copy.textContent ?? '';
    });
    expect(prose).toContain('The amplitude of the current is');
    expect(prose).not.toMatch(/\\frac|\$/);

    await page.reload();
    await expect.poll(() => page.getByTestId('result-Z').first().textContent()).toContain('13.05');
  });

  it('gives the inrush template the same peak current for 500 and for 20 000 points, found from the solution', async () => {
    const { page } = s;
    await asEngineer2(page, 'Inrush when the bank is energised', 'C-901');
    const cell = page.getByRole('region', { name: 'Cell 4: Transient' });
    const row = (label: string) =>
      cell
        .getByRole('table', { name: 'Transient results' })
        .getByRole('row')
        .filter({ has: page.getByRole('rowheader', { name: label, exact: true }) });
    await row('Peak current').waitFor();
    const first = (await row('Peak current').textContent()) ?? '';
    expect(first).toMatch(/i = \d[\d.]* kA at t = [\d.]+ µs/);
    // ω0 and ωd in rad/s, α in s⁻¹: never a frequency in Hz.
    const damping = (await row('Damping').textContent()) ?? '';
    expect(damping).toMatch(/ω0 = [\d.]+ rad\/s/);
    expect(damping).toMatch(/α = [\d.]+ s⁻¹/);
    expect(damping).not.toMatch(/Hz/);
    for (const points of ['500', '20000']) {
      await cell.getByRole('button', { name: 'Edit' }).click();
      await cell.getByLabel('Points').fill(points);
      await expect.poll(() => cell.getByTestId('save-state').textContent(), { timeout: 15000 }).toBe('Saved');
      await cell.getByRole('button', { name: 'Done' }).click();
      // What the server stored for this number of points, read afresh.
      await page.reload();
      await row('Peak current').waitFor();
      await cell.getByRole('button', { name: 'Edit' }).click();
      expect(await cell.getByLabel('Points').inputValue()).toBe(points);
      expect(await row('Peak current').textContent()).toBe(first);
      await cell.getByRole('button', { name: 'Done' }).click();
    }
  });
});
