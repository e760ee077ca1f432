import { render, screen } from '@testing-library/react';
import { createMemoryRouter, RouterProvider } from 'react-router-dom';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { AppProviders } from './providers';
import { routes } from './router';
import { sheetOf } from '../test-fixtures';

const health = { status: 'ok', version: '0', engineVersion: '0', checks: { database: 'up', mail: 'up', objectStore: 'up' } };
const me = (roles: string[]) => ({
  user: { id: 'u1', email: 'probe@test.example', name: 'Probe Person' },
  firm: { id: 'f1', name: 'Probe Consulting' },
  roles,
  csrfToken: 'c',
});

/** A fake server: health, who is signed in (or 401), and empty lists. */
function serve(roles: string[] | null) {
  vi.stubGlobal(
    'fetch',
    vi.fn(async (url: string) => {
      if (url.endsWith('/api/health')) return new Response(JSON.stringify(health));
      if (url.endsWith('/api/auth/me'))
        return roles
          ? new Response(JSON.stringify(me(roles)))
          : new Response(JSON.stringify({ statusCode: 401, code: 'UNAUTHENTICATED', message: 'Sign in to continue.' }), { status: 401 });
      if (url.endsWith('/api/sheets/s1'))
        return new Response(
          JSON.stringify(sheetOf(1, [], { title: 'Probe sheet', engineVersion: '0', preparer: { id: 'u1', name: 'Probe Person' }, authorIds: ['u1'] })),
        );
      return new Response('[]');
    }),
  );
}

function renderAt(path: string) {
  const router = createMemoryRouter(routes, { initialEntries: [path] });
  render(
    <AppProviders>
      <RouterProvider router={router} />
    </AppProviders>,
  );
  return router;
}

describe('routes', () => {
  afterEach(() => vi.unstubAllGlobals());

  it.each([
    ['/sign-in', 'Sign in', 1],
    ['/register', 'Register your firm', 1],
    ['/forgot-password', 'Reset your password', 1],
    ['/verify', 'Verify a package', 1],
  ])('shows the public page %s inside the shell', async (path, heading, level) => {
    serve(null);
    renderAt(path);
    expect(await screen.findByRole('heading', { level, name: heading })).toBeTruthy();
    expect(screen.getByRole('navigation', { name: 'Main' })).toBeTruthy();
  });

  it('sends a signed-out visitor of a guarded page to sign in, remembering where they were', async () => {
    serve(null);
    const router = renderAt('/projects/p1/sheets/s1');
    expect(await screen.findByRole('heading', { name: 'Sign in' })).toBeTruthy();
    expect(router.state.location.pathname).toBe('/sign-in');
    expect(router.state.location.search).toBe(`?next=${encodeURIComponent('/projects/p1/sheets/s1')}`);
  });

  it('shows a member the guarded pages, with firm and roles in the shell', async () => {
    serve(['engineer', 'checker']);
    renderAt('/projects');
    expect(await screen.findByRole('heading', { level: 1, name: 'Projects' })).toBeTruthy();
    expect((await screen.findByTestId('firm-and-roles')).textContent).toBe('Probe Consulting · Engineer, Checker');
  });

  it("keeps a client out of the firm's pages", async () => {
    serve(['client']);
    renderAt('/projects');
    expect(await screen.findByText(/do not give access to that page/)).toBeTruthy();
  });

  it('shows a not-found page for an unknown address', async () => {
    serve(null);
    renderAt('/no/such/page');
    expect(await screen.findByRole('heading', { name: 'No page at this address' })).toBeTruthy();
  });

  it('shows the server status from /api/health', async () => {
    serve(null);
    renderAt('/');
    expect(await screen.findByText('Server ready')).toBeTruthy();
  });

  it('carries the cautions notice on the sheet page', async () => {
    serve(['engineer']);
    renderAt('/projects/p1/sheets/s1');
    expect((await screen.findByRole('note', { name: 'Caution' })).textContent).toMatch(/qualified engineers/);
  });
});
