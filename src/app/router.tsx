import { createBrowserRouter, Navigate } from 'react-router-dom';
import { AppShell, RequireAdmin, RequireSession } from './app-shell';
import { RouteError, NotFoundRoute } from './routes/route-error';
import { SignInRoute } from './routes/sign-in';
import { AcceptInvitationRoute } from './routes/accept-invitation';
import { ProjectsRoute } from './routes/projects';
import { ProjectRoute } from './routes/project';
import { TrussRoute } from './routes/truss';
import { UsersRoute } from './routes/admin/users';
import { OutboxRoute } from './routes/admin/outbox';
import { FirmRoute } from './routes/admin/firm';

export function createAppRouter() {
  return createBrowserRouter([
    {
      errorElement: <RouteError />,
      children: [
        { path: '/sign-in', element: <SignInRoute /> },
        { path: '/invite/:token', element: <AcceptInvitationRoute /> },
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
                { path: '/trusses/:trussId', element: <TrussRoute /> },
                {
                  path: '/admin',
                  element: <RequireAdmin />,
                  children: [
                    { index: true, element: <Navigate to="/admin/users" replace /> },
                    { path: 'users', element: <UsersRoute /> },
                    { path: 'outbox', element: <OutboxRoute /> },
                    { path: 'firm', element: <FirmRoute /> },
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
