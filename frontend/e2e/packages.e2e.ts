import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { useBrowserPage } from './support/browser';
import { signIn } from './support/flows';

describe('the client portal and the verification page in a real browser', () => {
  const s = useBrowserPage({ beforeAll, afterAll, beforeEach });

  it(
    'gives the demo client their issued package; the verification page calls it unaltered, and altered after one byte changes',
    { timeout: 120_000 },
    async () => {
      const { page } = s;
      await signIn(page, 'client@kestrelridge.example', '/portal');
      await page.waitForURL(/\/portal$/);
      const table = page.getByRole('table', { name: 'Issued packages' });
      await table.getByText('C-106', { exact: false }).waitFor();
      // Only the client's own project: every row is Kestrel Ridge's job.
      const rows = await table.locator('tbody tr').allTextContents();
      expect(rows.length).toBeGreaterThan(0);
      for (const r of rows) expect(r).toContain('NE-2417');
      const link = table.getByTestId('package-download').first();
      await link.waitFor({ timeout: 60_000 });
      const [download] = await Promise.all([page.waitForEvent('download'), link.click()]);
      const pdf = readFileSync((await download.path())!);
      expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
      expect(await page.getByRole('note', { name: 'Caution' }).count()).toBe(1);

      // Anyone, signed out, can check it.
      const visitor = await (await s.browser.newContext()).newPage();
      await visitor.goto(page.url().replace('/portal', '/verify'));
      await visitor.getByTestId('verify-input').setInputFiles({ name: 'package.pdf', mimeType: 'application/pdf', buffer: pdf });
      await expect
        .poll(() => visitor.getByTestId('verdict').textContent(), { timeout: 15_000 })
        .toMatch(/An unaltered package: .*sheet C-106 .*revision A, issued on .* by Northfold Engineering\./);
      const altered = Buffer.from(pdf);
      const at = altered.indexOf('stream') + 20;
      altered[at] ^= 0x01;
      await visitor.getByTestId('verify-input').setInputFiles({ name: 'package.pdf', mimeType: 'application/pdf', buffer: altered });
      await expect.poll(() => visitor.getByTestId('verdict').textContent(), { timeout: 15_000 }).toMatch(/altered after signing/);
      await visitor.getByTestId('verify-input').setInputFiles({ name: 'notes.pdf', mimeType: 'application/pdf', buffer: Buffer.from('plain text') });
      await expect.poll(() => visitor.getByTestId('verdict').textContent(), { timeout: 15_000 }).toMatch(/not a PDF/);
    },
  );
});
