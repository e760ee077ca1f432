import { createBrowserRouter, type RouteObject } from 'react-router-dom';
import { AppShell } from '../components/layout/app-shell';
import { RouteError } from '../components/errors/route-error';
import { HomePage } from '../routes/home';
import { NotFoundPage } from '../routes/not-found';
import { PortalPage } from '../routes/portal';
import { ProjectPage } from '../routes/project';
import { ProjectsPage } from '../routes/projects';
import { SheetPage } from '../routes/sheet';
import { SheetHistoryPage } from '../routes/sheet-history';
import { NotificationsPage } from '../routes/notifications';
import { SignInPage } from '../routes/sign-in';
import { VerifyPage } from '../routes/verify';
import { AcceptInvitationPage } from '../routes/accept-invitation';
import { ForgotPasswordPage } from '../routes/forgot-password';
import { MembersPage } from '../routes/members';
import { NoAccessPage } from '../routes/no-access';
import { ProfilePage } from '../routes/profile';
import { RegisterPage } from '../routes/register';
import { ConfirmRegistrationPage } from '../routes/confirm-registration';
import { ResetPasswordPage } from '../routes/reset-password';
import { RequireAuth } from '../features/auth';
import { MEMBER_ROLES } from '@ampwright/common/review/workflow';

const MEMBERS = [...MEMBER_ROLES];

export const routes: RouteObject[] = [
  {
    path: '/',
    element: <AppShell />,
    errorElement: <RouteError />,
    children: [
      { index: true, element: <HomePage /> },
      { path: 'sign-in', element: <SignInPage /> },
      { path: 'register', element: <RegisterPage /> },
      { path: 'confirm-registration', element: <ConfirmRegistrationPage /> },
      { path: 'forgot-password', element: <ForgotPasswordPage /> },
      { path: 'reset-password', element: <ResetPasswordPage /> },
      { path: 'accept-invitation', element: <AcceptInvitationPage /> },
      { path: 'no-access', element: <NoAccessPage /> },
      {
        path: 'profile',
        element: (
          <RequireAuth>
            <ProfilePage />
          </RequireAuth>
        ),
      },
      {
        path: 'members',
        element: (
          <RequireAuth roles={MEMBERS}>
            <MembersPage />
          </RequireAuth>
        ),
      },
      {
        path: 'projects',
        element: (
          <RequireAuth roles={MEMBERS}>
            <ProjectsPage />
          </RequireAuth>
        ),
      },
      {
        path: 'projects/:projectId',
        element: (
          <RequireAuth roles={MEMBERS}>
            <ProjectPage />
          </RequireAuth>
        ),
      },
      {
        path: 'projects/:projectId/sheets/:sheetId',
        element: (
          <RequireAuth roles={MEMBERS}>
            <SheetPage />
          </RequireAuth>
        ),
      },
      {
        path: 'projects/:projectId/sheets/:sheetId/history',
        element: (
          <RequireAuth roles={MEMBERS}>
            <SheetHistoryPage />
          </RequireAuth>
        ),
      },
      {
        path: 'notifications',
        element: (
          <RequireAuth>
            <NotificationsPage />
          </RequireAuth>
        ),
      },
      {
        path: 'portal',
        element: (
          <RequireAuth>
            <PortalPage />
          </RequireAuth>
        ),
      },
      { path: 'verify', element: <VerifyPage /> },
      { path: '*', element: <NotFoundPage /> },
    ],
  },
];

export const createRouter = () => createBrowserRouter(routes);
