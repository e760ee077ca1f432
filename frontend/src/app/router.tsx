import { createBrowserRouter, type RouteObject } from 'react-router-dom';
import { AppShell } from '../components/layout/app-shell';
import { RouteError } from '../components/errors/route-error';
import { HomePage } from '../routes/home';
import { NotFoundPage } from '../routes/not-found';
import { PortalPage } from '../routes/portal';
import { ProjectsPage } from '../routes/projects';
import { SheetPage } from '../routes/sheet';
import { SignInPage } from '../routes/sign-in';
import { VerifyPage } from '../routes/verify';

export const routes: RouteObject[] = [
  {
    path: '/',
    element: <AppShell />,
    errorElement: <RouteError />,
    children: [
      { index: true, element: <HomePage /> },
      { path: 'sign-in', element: <SignInPage /> },
      { path: 'projects', element: <ProjectsPage /> },
      { path: 'projects/:projectId/sheets/:sheetId', element: <SheetPage /> },
      { path: 'portal', element: <PortalPage /> },
      { path: 'verify', element: <VerifyPage /> },
      { path: '*', element: <NotFoundPage /> },
    ],
  },
];

export const createRouter = () => createBrowserRouter(routes);
