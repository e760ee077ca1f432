import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { baseUrl, useBrowserPage } from './support/browser';

describe('projects and sheets in a real browser', () => {
  const s = useBrowserPage({ beforeAll, afterAll, beforeEach });

  it('creates a project and a sheet from the series RLC template, and shows its typeset results', async () => {
    const { page } = s;
    await page.goto(`${baseUrl()}/sign-in?next=/projects`);
    await page.getByLabel('E-mail address').fill('engineer@northfold.example');
    await page.getByLabel('Password').fill('Ampwright-demo-1');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(/\/projects$/);
    await page.getByRole('table', { name: 'Projects' }).getByText('NE-2417').waitFor();

    const job = `E2E-${Date.now().toString(36)}`;
    await page.getByRole('button', { name: 'New project' }).click();
    await page.getByLabel('Job number').fill(job);
    await page.getByLabel('Title').fill('Browser test project');
    await page.getByLabel('Client organisation').fill('Kestrel Ridge Cold Storage');
    await page.getByLabel('Site').fill('Cold store 2');
    await page.getByRole('button', { name: 'Create the project' }).click();
    await page.waitForURL(/\/projects\/[0-9a-f-]{36}$/);

    await page.getByRole('button', { name: 'New sheet' }).click();
    await page.getByLabel('Sheet number').fill('C-900');
    await page.getByLabel('Start from').click();
    await page.getByRole('option', { name: 'Series RLC branch: steady-state current at the supply frequency' }).click();
    await page.getByRole('button', { name: 'Create the sheet' }).click();
    await page.waitForURL(/\/sheets\/[0-9a-f-]{36}$/);
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe('Series RLC branch: steady-state current at the supply frequency');
    await expect.poll(() => page.getByTestId('result-Z').first().textContent()).toContain('13.05');
    expect(await page.getByTestId('check-outcome').first().textContent()).toBe('Pass');
    expect(await page.getByRole('note', { name: 'Caution' }).count()).toBe(1);

    await page.reload();
    await expect.poll(() => page.getByTestId('result-Z').first().textContent()).toContain('13.05');
  });
});
