import type { ComponentType } from 'react';
import { createBrowserRouter, type RouteObject } from 'react-router-dom';
import { AppShell } from '../components/layout/app-shell';
import { RouteError } from '../components/errors/route-error';
import { HomePage } from '../routes/home';
import { NotFoundPage } from '../routes/not-found';
import { NoAccessPage } from '../routes/no-access';
import { RequireAuth, type Role } from '../features/auth';
import { MEMBER_ROLES } from '@ampwright/common/review/workflow';

const MEMBERS = [...MEMBER_ROLES];

/**
 * A page loaded when it is first visited (its code and its heavy libraries — the editor, KaTeX, the charts —
 * in their own chunks), behind the sign-in check when `access` says so: the first page stays light.
 */
function page(load: () => Promise<ComponentType>, access?: 'signed-in' | Role[]): Pick<RouteObject, 'lazy'> {
  return {
    lazy: async () => {
      const Page = await load();
      if (!access) return { element: <Page /> };
      return {
        element: (
          <RequireAuth roles={access === 'signed-in' ? undefined : access}>
            <Page />
          </RequireAuth>
        ),
      };
    },
  };
}

export const routes: RouteObject[] = [
  {
    path: '/',
    element: <AppShell />,
    errorElement: <RouteError />,
    children: [
      { index: true, element: <HomePage /> },
      { path: 'sign-in', ...page(async () => (await import('../routes/sign-in')).SignInPage) },
      { path: 'register', ...page(async () => (await import('../routes/register')).RegisterPage) },
      { path: 'confirm-registration', ...page(async () => (await import('../routes/confirm-registration')).ConfirmRegistrationPage) },
      { path: 'forgot-password', ...page(async () => (await import('../routes/forgot-password')).ForgotPasswordPage) },
      { path: 'reset-password', ...page(async () => (await import('../routes/reset-password')).ResetPasswordPage) },
      { path: 'accept-invitation', ...page(async () => (await import('../routes/accept-invitation')).AcceptInvitationPage) },
      { path: 'no-access', element: <NoAccessPage /> },
      { path: 'profile', ...page(async () => (await import('../routes/profile')).ProfilePage, 'signed-in') },
      { path: 'members', ...page(async () => (await import('../routes/members')).MembersPage, MEMBERS) },
      { path: 'projects', ...page(async () => (await import('../routes/projects')).ProjectsPage, MEMBERS) },
      { path: 'projects/:projectId', ...page(async () => (await import('../routes/project')).ProjectPage, MEMBERS) },
      { path: 'projects/:projectId/sheets/:sheetId', ...page(async () => (await import('../routes/sheet')).SheetPage, MEMBERS) },
      { path: 'projects/:projectId/sheets/:sheetId/history', ...page(async () => (await import('../routes/sheet-history')).SheetHistoryPage, MEMBERS) },
      { path: 'notifications', ...page(async () => (await import('../routes/notifications')).NotificationsPage, 'signed-in') },
      { path: 'portal', ...page(async () => (await import('../routes/portal')).PortalPage, 'signed-in') },
      { path: 'verify', ...page(async () => (await import('../routes/verify')).VerifyPage) },
      { path: '*', element: <NotFoundPage /> },
    ],
  },
];

export const createRouter = () => createBrowserRouter(routes);
