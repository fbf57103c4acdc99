import type { ReactNode } from 'react';
import { Navigate, NavLink, Outlet, useLocation, useNavigate } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { Wordmark } from '@/components/ui/wordmark';
import { useSession } from '@/features/auth/api/get-session';
import { useSignOut } from '@/features/auth/api/sign-out';
import { useMyWork } from '@/features/my-work/api/get-my-work';
import { Notices } from '@/lib/notices';
import { isAdmin, ROLE_LABELS } from '@/lib/permissions';
import { useCurrentUser } from './current-user';

export const CAUTION = 'Results must be reviewed by a licensed engineer; local codes govern.';

/** Lets the page through only with a session; otherwise to sign-in, remembering where the person was going. */
export function RequireSession({ children }: { children: ReactNode }) {
  const session = useSession();
  const location = useLocation();
  if (session.isPending) return <FullPageLoading />;
  if (session.isError) {
    return (
      <div className="mx-auto max-w-lg px-6 py-16">
        <Wordmark />
        <ErrorState title="Panelpoint could not be reached" error={session.error} onRetry={() => void session.refetch()} />
      </div>
    );
  }
  if (!session.data.user) {
    const next = location.pathname + location.search;
    return <Navigate to={next === '/' ? '/sign-in' : `/sign-in?next=${encodeURIComponent(next)}`} replace />;
  }
  return <>{children}</>;
}

export function RequireAdmin() {
  const user = useCurrentUser();
  if (!isAdmin(user.role)) {
    return (
      <EmptyState>
        Only an admin can open this page. Ask your firm’s admin if you need a user, firm or outbox change.
      </EmptyState>
    );
  }
  return <Outlet />;
}

function FullPageLoading() {
  return (
    <div className="mx-auto max-w-lg px-6 py-16">
      <LoadingState label="Opening Panelpoint…" />
    </div>
  );
}

function NavItem({ to, children }: { to: string; children: ReactNode }) {
  return (
    <NavLink
      to={to}
      className={({ isActive }) =>
        // The open page is marked by a 3 px accent rule along the top edge of the bar, over its word.
        `relative flex h-full items-center px-3 text-sm ${
          isActive
            ? 'font-semibold text-ink before:absolute before:inset-x-2 before:top-0 before:h-[3px] before:bg-accent'
            : 'text-ink-soft hover:text-ink hover:underline hover:decoration-paper-rule hover:underline-offset-4'
        }`
      }
    >
      {children}
    </NavLink>
  );
}

/** "My work" with the number of things waiting, refreshed by its query (every minute and after each move). */
function MyWorkNavItem() {
  const work = useMyWork();
  const count = work.data?.total ?? 0;
  return (
    <NavItem to="/my-work">
      My work
      {count > 0 && (
        <span
          data-testid="my-work-count"
          aria-label={`${count} waiting`}
          className="ml-1.5 inline-flex min-w-5 justify-center border-l-2 border-accent pl-1 text-[12px] leading-4 font-semibold text-accent tabular-nums"
        >
          {count}
        </span>
      )}
    </NavItem>
  );
}

/** The frame around every signed-in page: the bar with navigation for the role, the page, the caution line. */
export function AppShell() {
  const user = useCurrentUser();
  const signOut = useSignOut();
  const navigate = useNavigate();

  return (
    <div className="flex min-h-screen flex-col">
      <header className="border-b border-ink-soft bg-paper">
        <div className="mx-auto flex min-h-14 max-w-6xl flex-wrap items-stretch gap-x-6 px-6">
          <NavLink to="/projects" className="flex items-center" aria-label="Panelpoint, projects">
            <Wordmark />
          </NavLink>
          <nav aria-label="Main" className="flex h-14 items-stretch">
            <NavItem to="/projects">Projects</NavItem>
            <MyWorkNavItem />
            <NavItem to="/archive">Archive</NavItem>
            <NavItem to="/verify">Verify</NavItem>
            {isAdmin(user.role) && (
              <>
                <span aria-hidden className="mx-2 my-4 w-px bg-paper-rule" />
                <NavItem to="/admin/users">Users</NavItem>
                <NavItem to="/admin/outbox">Outbox</NavItem>
                <NavItem to="/admin/firm">Firm</NavItem>
              </>
            )}
          </nav>
          <div className="ml-auto flex h-14 items-center gap-3">
            <NavLink to="/account" className="hidden text-right leading-tight hover:underline sm:block" title="Your account and password">
              <div className="text-sm font-medium text-ink">{user.name}</div>
              <div className="hidden text-[12px] text-ink-faint lg:block">{user.email}</div>
            </NavLink>
            <NavLink to="/account" className="text-sm text-ink-soft hover:text-ink sm:hidden">
              Account
            </NavLink>
            <span className="border-l border-paper-rule pl-3 text-[13px] text-ink-soft">{ROLE_LABELS[user.role]}</span>
            <Button
              size="sm"
              variant="quiet"
              busy={signOut.isPending}
              onClick={() => signOut.mutate(undefined, { onSuccess: () => navigate('/sign-in', { replace: true }) })}
            >
              Sign out
            </Button>
          </div>
        </div>
      </header>
      <main className="mx-auto w-full max-w-6xl flex-1 px-6 pt-7 pb-12">
        <Notices className="mb-5" />
        <Outlet />
      </main>
      <Footer />
    </div>
  );
}

export function Footer() {
  return (
    <footer className="border-t border-paper-rule">
      <p className="mx-auto max-w-6xl px-6 py-3 text-xs text-ink-faint">{CAUTION}</p>
    </footer>
  );
}
