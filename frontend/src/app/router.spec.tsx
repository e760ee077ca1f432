import { render, screen } from '@testing-library/react';
import { createMemoryRouter, RouterProvider } from 'react-router-dom';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { AppProviders } from './providers';
import { routes } from './router';

function renderAt(path: string) {
  const router = createMemoryRouter(routes, { initialEntries: [path] });
  render(
    <AppProviders>
      <RouterProvider router={router} />
    </AppProviders>,
  );
}

describe('routes', () => {
  beforeEach(() => {
    vi.stubGlobal('fetch', vi.fn(async () => new Response(JSON.stringify({ status: 'ok', version: '0', engineVersion: '0', checks: { database: 'up', mail: 'up', objectStore: 'up' } }))));
  });
  afterEach(() => vi.unstubAllGlobals());

  it.each([
    ['/sign-in', 'Sign in'],
    ['/projects', 'Projects'],
    ['/projects/p1/sheets/s1', 'Sheet s1'],
    ['/portal', 'Client portal'],
    ['/verify', 'Verify a package'],
  ])('shows the page for %s inside the shell', async (path, heading) => {
    renderAt(path);
    expect(await screen.findByRole('heading', { level: 1, name: heading })).toBeTruthy();
    expect(screen.getByRole('navigation', { name: 'Main' })).toBeTruthy();
  });

  it('shows a not-found page for an unknown address', async () => {
    renderAt('/no/such/page');
    expect(await screen.findByRole('heading', { name: 'No page at this address' })).toBeTruthy();
  });

  it('shows the server status from /api/health', async () => {
    renderAt('/');
    expect(await screen.findByText('Server ready')).toBeTruthy();
  });

  it('carries the cautions notice on the sheet page', async () => {
    renderAt('/projects/p1/sheets/s1');
    expect((await screen.findByRole('note', { name: 'Caution' })).textContent).toMatch(/qualified engineers/);
  });
});
