import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { useBrowserPage } from './support/browser';
import { newSheetFromTemplate, signIn } from './support/flows';

describe('projects and sheets in a real browser', () => {
  const s = useBrowserPage({ beforeAll, afterAll, beforeEach });

  it('creates a project and a sheet from the series RLC template, and shows its typeset results', async () => {
    const { page } = s;
    // A second engineer: the first signs in more than five times a minute across the other files (the per-account limit).
    await signIn(page, 'engineer2@northfold.example', '/projects');
    await page.waitForURL(/\/projects$/);
    await page.getByRole('table', { name: 'Projects' }).getByText('NE-2417').waitFor();
    await newSheetFromTemplate(page, 'Series RLC branch: steady-state current at the supply frequency', 'C-900');
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe('Series RLC branch: steady-state current at the supply frequency');
    await expect.poll(() => page.getByTestId('result-Z').first().textContent()).toContain('13.05');
    expect(await page.getByTestId('check-outcome').first().textContent()).toBe('Pass');
    expect(await page.getByRole('note', { name: 'Caution' }).count()).toBe(1);

    await page.reload();
    await expect.poll(() => page.getByTestId('result-Z').first().textContent()).toContain('13.05');
  });
});
