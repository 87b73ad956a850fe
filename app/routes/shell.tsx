import { NavLink, Outlet } from "react-router";

// The desk's frame: a top bar with the mark and the main sections, content below.
export default function Shell() {
  const link = ({ isActive }: { isActive: boolean }) =>
    `rounded px-2 py-1 text-sm ${isActive ? "bg-paper/10 text-paper" : "text-paper/70 hover:text-paper"}`;
  return (
    <div className="flex min-h-screen flex-col">
      <header className="bg-ink text-paper">
        <div className="mx-auto flex max-w-7xl items-center gap-6 px-4 py-3">
          <a href="/" className="flex items-center gap-2 font-semibold tracking-tight">
            <img src="/favicon.svg" alt="" className="h-6 w-6" />
            Strutwise
          </a>
          <nav className="flex gap-2" aria-label="Main">
            <NavLink to="/" end className={link}>Desk</NavLink>
          </nav>
        </div>
      </header>
      <main className="mx-auto w-full max-w-7xl flex-1 px-4 py-8">
        <Outlet />
      </main>
      <footer className="border-t border-rule py-4 text-center text-xs text-ink-muted">
        Strutwise — results are a design aid, not a design.
      </footer>
    </div>
  );
}
