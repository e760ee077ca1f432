import type { Page } from 'playwright-core';
import { baseUrl } from './browser';

/** Signs in through the form and lands on `next`. */
export async function signIn(page: Page, email: string, next: string, password = 'Ampwright-demo-1') {
  await page.goto(`${baseUrl()}/sign-in?next=${encodeURIComponent(next)}`);
  await page.getByLabel('E-mail address').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
}

/** From the projects list: a new project, then a new sheet in it from a template; ends on the sheet. */
export async function newSheetFromTemplate(page: Page, template: string, sheetNumber: string) {
  const job = `E2E-${Date.now().toString(36)}`;
  await page.getByRole('button', { name: 'New project' }).click();
  await page.getByLabel('Job number').fill(job);
  await page.getByLabel('Title').fill('Browser test project');
  await page.getByLabel('Client organisation').fill('Kestrel Ridge Cold Storage');
  await page.getByLabel('Site').fill('Cold store 2');
  await page.getByRole('button', { name: 'Create the project' }).click();
  await page.waitForURL(/\/projects\/[0-9a-f-]{36}$/);
  // The creator is on the new project's team.
  await page
    .getByTestId('project-team')
    .getByText(/Engineer|Owner/)
    .first()
    .waitFor();
  await page.getByRole('button', { name: 'New sheet' }).click();
  await page.getByLabel('Sheet number').fill(sheetNumber);
  await page.getByLabel('Start from').click();
  await page.getByRole('option', { name: template }).click();
  await page.getByRole('button', { name: 'Create the sheet' }).click();
  await page.waitForURL(/\/sheets\/[0-9a-f-]{36}$/);
}
