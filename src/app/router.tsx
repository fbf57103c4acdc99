import { createBrowserRouter, Navigate } from 'react-router-dom';
import { AppShell, RequireAdmin, RequireSession } from './app-shell';
import { RouteError, NotFoundRoute, PageLoading } from './routes/route-error';
import { SignInRoute } from './routes/sign-in';
import { AcceptInvitationRoute } from './routes/accept-invitation';
import { ForgotPasswordRoute } from './routes/forgot-password';
import { ResetPasswordRoute } from './routes/reset-password';
import { ProjectsRoute } from './routes/projects';
import { ProjectRoute } from './routes/project';

export function createAppRouter() {
  return createBrowserRouter([
    {
      errorElement: <RouteError />,
      // Shown while a lazily loaded page's code arrives on first load.
      hydrateFallbackElement: <PageLoading />,
      children: [
        { path: '/sign-in', element: <SignInRoute /> },
        { path: '/invite/:token', element: <AcceptInvitationRoute /> },
        { path: '/forgot-password', element: <ForgotPasswordRoute /> },
        { path: '/reset-password/:token', element: <ResetPasswordRoute /> },
        // The verify address printed on every issued sheet: open to anyone holding it.
        { path: '/verify/:sheetId', lazy: async () => ({ Component: (await import('./routes/public-verify')).PublicVerifyRoute }) },
        {
          element: (
            <RequireSession>
              <AppShell />
            </RequireSession>
          ),
          children: [
            {
              errorElement: <RouteError />,
              children: [
                { index: true, element: <Navigate to="/projects" replace /> },
                { path: '/projects', element: <ProjectsRoute /> },
                { path: '/projects/:projectId', element: <ProjectRoute /> },
                // The truss page will carry the drawing, loads and solver: loaded when first opened.
                { path: '/trusses/:trussId', lazy: async () => ({ Component: (await import('./routes/truss')).TrussRoute }) },
                { path: '/sheets/:sheetId', lazy: async () => ({ Component: (await import('./routes/sheet')).SheetRoute }) },
                { path: '/my-work', lazy: async () => ({ Component: (await import('./routes/my-work')).MyWorkRoute }) },
                { path: '/archive', lazy: async () => ({ Component: (await import('./routes/archive')).ArchiveRoute }) },
                { path: '/account', lazy: async () => ({ Component: (await import('./routes/account')).AccountRoute }) },
                { path: '/verify', lazy: async () => ({ Component: (await import('./routes/verify')).VerifyRoute }) },
                {
                  path: '/admin',
                  element: <RequireAdmin />,
                  children: [
                    { index: true, element: <Navigate to="/admin/users" replace /> },
                    { path: 'users', lazy: async () => ({ Component: (await import('./routes/admin/users')).UsersRoute }) },
                    { path: 'outbox', lazy: async () => ({ Component: (await import('./routes/admin/outbox')).OutboxRoute }) },
                    { path: 'firm', lazy: async () => ({ Component: (await import('./routes/admin/firm')).FirmRoute }) },
                  ],
                },
                { path: '*', element: <NotFoundRoute /> },
              ],
            },
          ],
        },
      ],
    },
  ]);
}
