import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { useBrowserPage } from './support/browser';
import { seriousViolations } from './support/axe';
import { newSheetFromTemplate, signIn } from './support/flows';

describe('the network cell in a real browser', () => {
  const s = useBrowserPage({ beforeAll, afterAll, beforeEach });

  it('shows a network study (scan, harmonic flow, transient) from its template, and names the row of a bad node once edited', async () => {
    const { page } = s;
    await signIn(page, 'engineer@northfold.example', '/projects');
    await page.waitForURL(/\/projects$/);
    await newSheetFromTemplate(page, 'Main switchboard bank in its network: resonance, harmonic flow and switching', 'N-930');

    // The scan: its conventions, the resonances as a table and the impedance drawn with them marked.
    const scan = page.getByRole('region', { name: 'Cell 4: Network' });
    await scan.getByText(/Per phase, positive sequence, single-phase equivalent/).waitFor();
    await scan.getByText(/Resonances seen from node LV/).waitFor();
    const rows = scan.getByRole('row');
    await expect.poll(async () => (await rows.allTextContents()).join(' | ')).toMatch(/parallel.*3\.4\d\d/);
    await scan.getByRole('figure', { name: /Driving-point impedance/ }).waitFor();
    // The harmonic flow: the distortion at LV within the IEEE 519 limits, and the check below that reads THD_LV.
    const flow = page.getByRole('region', { name: 'Cell 5: Network' });
    await expect.poll(async () => (await flow.getByRole('row').allTextContents()).join(' | ')).toMatch(/LV.*within/);
    await page.getByRole('region', { name: 'Cell 6: Check' }).getByText(/pass/i).first().waitFor();
    // The transient: the extremes, located from the solution.
    await page
      .getByRole('region', { name: 'Cell 8: Network' })
      .getByText(/Extremes over 40(\.00)? ms/)
      .waitFor();
    expect(await seriousViolations(page)).toEqual([]);

    // A misspelt node: the cell says which row, and the row is marked in the editor.
    await flow.getByRole('button', { name: 'Edit' }).click();
    const from = flow.getByLabel('Row 3 from node');
    await from.fill('LVx');
    await expect.poll(() => flow.getByText(/node LVx is joined only by row 3 \(Rload\)/).count(), { timeout: 15000 }).toBeGreaterThan(0);
    expect(await seriousViolations(page)).toEqual([]);
    await from.fill('LV');
    await expect.poll(() => flow.getByText(/node LVx is joined only by/).count(), { timeout: 15000 }).toBe(0);
  });
});
