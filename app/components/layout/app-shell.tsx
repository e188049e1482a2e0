import { useState } from 'react';
import { Link, NavLink, Outlet, useNavigation } from 'react-router-dom';
import { AccountControl } from './account-control.tsx';
import { useSession } from '../../lib/session/session-context.tsx';
import { paths } from '../../lib/paths.ts';
import { navItemsFor } from './nav-items.ts';
import { Wordmark } from './wordmark.tsx';

const NAV_ID = 'main-nav';

export function AppShell() {
  const session = useSession();
  const navigation = useNavigation();
  const [menuOpen, setMenuOpen] = useState(false);
  const items = navItemsFor(session);
  const loading = navigation.state === 'loading';

  return (
    <div className="flex min-h-screen flex-col">
      <a
        href="#main"
        className="sr-only rounded-lg bg-verdigris-800 px-4 py-3 font-semibold text-white focus:not-sr-only focus:fixed focus:top-2 focus:left-2 focus:z-50"
      >
        Skip to main content
      </a>
      <header className="border-b border-plaster-300 bg-white">
        <div className="mx-auto flex max-w-6xl items-center gap-3 px-4 py-3">
          <Link to={paths.home.href()} onClick={() => setMenuOpen(false)} className="inline-flex min-h-11 shrink-0 items-center rounded-lg no-underline">
            <Wordmark />
          </Link>
          <div className="ml-auto flex min-w-0 items-center gap-3">
            <button
              type="button"
              className="inline-flex min-h-11 min-w-11 shrink-0 items-center justify-center gap-2 rounded-lg border border-graphite-500 px-3 font-semibold text-graphite-900 hover:bg-plaster-100 md:hidden"
              aria-expanded={menuOpen}
              aria-controls={NAV_ID}
              onClick={() => setMenuOpen((open) => !open)}
              data-testid="menu-button"
            >
              <span aria-hidden="true">{menuOpen ? '✕' : '☰'}</span>
              Menu
            </button>
            <AccountControl />
          </div>
        </div>
        <nav id={NAV_ID} aria-label="Main" className={`${menuOpen ? 'block' : 'hidden'} border-t border-plaster-200 md:block`}>
          <ul className="mx-auto flex max-w-6xl flex-col gap-1 px-4 py-2 md:flex-row md:flex-wrap">
            {items.map((item) => (
              <li key={item.to}>
                <NavLink
                  to={item.to}
                  end={item.end}
                  // A chosen destination closes the phone menu; otherwise it would cover the page just opened.
                  onClick={() => setMenuOpen(false)}
                  className={({ isActive }) =>
                    `flex min-h-11 items-center rounded-lg px-4 font-semibold no-underline ${
                      isActive ? 'bg-verdigris-100 text-verdigris-900' : 'text-graphite-700 hover:bg-plaster-100 hover:text-graphite-900'
                    }`
                  }
                >
                  {item.label}
                </NavLink>
              </li>
            ))}
          </ul>
        </nav>
      </header>
      {/* A slim bar while the next page's code and data load; the page itself says "Loading…" if it must. */}
      <div aria-hidden="true" className={`h-1 bg-verdigris-600 transition-opacity ${loading ? 'animate-pulse opacity-100' : 'opacity-0'}`} />
      <main id="main" tabIndex={-1} aria-busy={loading || undefined} className="mx-auto flex w-full max-w-6xl flex-1 flex-col gap-6 px-4 py-6">
        <Outlet />
      </main>
      <footer className="border-t border-plaster-300 bg-plaster-100">
        <p className="mx-auto max-w-6xl px-4 py-4 text-sm text-graphite-600">
          Plinth records skin screening and consent; it is not a medical diagnosis.
        </p>
      </footer>
    </div>
  );
}
