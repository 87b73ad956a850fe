import { useState } from "react";
import { Form, NavLink, Outlet, useLocation, useNavigation } from "react-router";
import { can, ROLE_LABELS } from "~/lib/auth/permissions";
import { getUser } from "~/lib/auth/authorize.server";
import type { Route } from "./+types/shell";
import { withDependencies } from "~/lib/http.server";

// The desk's frame: a top bar with the mark, the sections this role may use and the
// account menu; content below. The loader only says who is signed in (pages check
// permissions themselves); the nav hides what the role cannot do.
export const loader = withDependencies(async function loader({ request }: Route.LoaderArgs) {
  const user = await getUser(request);
  return { user: user && { name: user.name, email: user.email, role: user.role } };
});

export default function Shell({ loaderData }: Route.ComponentProps) {
  const { user } = loaderData;
  const navigation = useNavigation();
  const location = useLocation();
  const [open, setOpen] = useState(false);
  const link = ({ isActive }: { isActive: boolean }) =>
    `block rounded px-2 py-1 text-sm ${isActive ? "bg-paper/10 text-paper" : "text-paper/75 hover:text-paper"}`;
  const isAdmin = !!user && can(user.role, "manage:users");

  const links = user ? (
    <>
      <NavLink to="/" end className={link} onClick={() => setOpen(false)}>
        Desk
      </NavLink>
      <NavLink to="/projects" className={link} onClick={() => setOpen(false)}>
        Projects
      </NavLink>
      <NavLink to="/jobs" className={link} onClick={() => setOpen(false)}>
        Jobs
      </NavLink>
      <NavLink to="/catalogues" className={link} onClick={() => setOpen(false)} data-testid="nav-catalogues">
        Catalogues
      </NavLink>
      {isAdmin && (
        <>
          <NavLink to="/admin/users" className={link} onClick={() => setOpen(false)} data-testid="nav-admin-users">
            Users
          </NavLink>
          <NavLink to="/admin/audit" className={link} onClick={() => setOpen(false)} data-testid="nav-admin-audit">
            Audit
          </NavLink>
          <NavLink to="/admin/mail" className={link} onClick={() => setOpen(false)} data-testid="nav-admin-mail">
            Mail
          </NavLink>
        </>
      )}
    </>
  ) : null;

  return (
    <div className="flex min-h-screen flex-col">
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:rounded focus:bg-paper focus:px-3 focus:py-2">
        Skip to content
      </a>
      <header className="bg-ink text-paper">
        <div className="mx-auto flex max-w-7xl items-center gap-4 px-4 py-3">
          <a href="/" className="flex items-center gap-2 font-semibold tracking-tight">
            <img src="/favicon.svg" alt="" className="h-6 w-6" />
            Strutwise
          </a>
          {user && (
            <nav className="hidden gap-1 md:flex" aria-label="Main">
              {links}
            </nav>
          )}
          <div className="ml-auto flex items-center gap-3 text-sm">
            {navigation.state !== "idle" && <span className="h-2 w-2 animate-pulse rounded-full bg-brass" aria-label="Loading" role="status" />}
            {user ? (
              <>
                <NavLink to="/account" className="hidden text-paper/80 hover:text-paper sm:block" data-testid="nav-account">
                  {user.name || user.email}
                  <span className="ml-2 rounded bg-paper/10 px-1.5 py-0.5 text-2xs uppercase tracking-wide" data-testid="nav-role">
                    {ROLE_LABELS[user.role]}
                  </span>
                </NavLink>
                <Form method="post" action="/sign-out" className="hidden md:block">
                  <button type="submit" className="rounded px-2 py-1 text-paper/75 hover:bg-paper/10 hover:text-paper">
                    Sign out
                  </button>
                </Form>
                <button
                  type="button"
                  className="rounded px-2 py-1 text-paper/80 hover:bg-paper/10 md:hidden"
                  aria-expanded={open}
                  aria-controls="mobile-nav"
                  onClick={() => setOpen((o) => !o)}
                >
                  Menu
                </button>
              </>
            ) : (
              location.pathname !== "/sign-in" && (
                <NavLink to="/sign-in" className="rounded bg-paper/10 px-3 py-1 text-paper hover:bg-paper/20">
                  Sign in
                </NavLink>
              )
            )}
          </div>
        </div>
        {user && open && (
          <nav id="mobile-nav" className="border-t border-paper/10 px-4 py-2 md:hidden" aria-label="Main">
            {links}
            <NavLink to="/account" className={link} onClick={() => setOpen(false)}>
              Account ({ROLE_LABELS[user.role]})
            </NavLink>
            <Form method="post" action="/sign-out">
              <button type="submit" className="block w-full rounded px-2 py-1 text-left text-sm text-paper/75 hover:text-paper">
                Sign out
              </button>
            </Form>
          </nav>
        )}
      </header>
      <main id="main" className="mx-auto w-full max-w-7xl flex-1 px-4 py-6 sm:py-8">
        <Outlet />
      </main>
      <footer className="border-t border-rule py-4 text-center text-xs text-ink-muted">
        Strutwise — results are a design aid, not a design.
      </footer>
    </div>
  );
}
