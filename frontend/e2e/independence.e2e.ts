import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { useBrowserPage } from './support/browser';
import { newSheetFromTemplate, signIn } from './support/flows';

/** The names a select offers, read from its open list, which is then closed. */
async function offered(page: Page, label: string): Promise<string[]> {
  await page.getByLabel(label).click();
  const names = (await page.getByRole('option').allTextContents()).map((t) => t.trim());
  await page.keyboard.press('Escape');
  await page.getByRole('listbox').waitFor({ state: 'detached' });
  return names;
}

describe('independent checking in a real browser', () => {
  const s = useBrowserPage({ beforeAll, afterAll, beforeEach });

  it('offers as checker and approver only people who had no hand in the revision', async () => {
    const { page } = s;
    await signIn(page, 'engineer2@northfold.example', '/projects');
    await page.waitForURL(/\/projects$/);
    await newSheetFromTemplate(page, 'Series RLC branch: steady-state current at the supply frequency', 'C-930');

    // Before anyone else prepares it: the demo checker and approver are offered.
    await page.getByRole('button', { name: 'Ask for a check' }).click();
    expect(await offered(page, 'Checker')).toEqual(['Priya Okonkwo']);
    expect(await offered(page, 'Approver (optional)')).toEqual(['Any approver', 'Hal Vermeulen']);
    await page.getByRole('button', { name: 'Cancel' }).click();

    // The preparer names the approver a co-preparer: he is no longer offered as approver.
    await page.getByRole('button', { name: 'Co-preparers' }).click();
    await page.getByLabel('Co-preparers').click();
    await page.getByRole('option', { name: 'Hal Vermeulen' }).click();
    await page.keyboard.press('Escape');
    await page.getByRole('button', { name: 'Save co-preparers' }).click();
    await page.getByText('Prepared by Aiko Brennan with Hal Vermeulen').waitFor();
    await page.getByRole('button', { name: 'Ask for a check' }).click();
    expect(await offered(page, 'Checker')).toEqual(['Priya Okonkwo']);
    expect(await offered(page, 'Approver (optional)')).toEqual(['Any approver']);
  });
});
