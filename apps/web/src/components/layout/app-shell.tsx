import type { ReactNode } from "react";
import { Link, NavLink } from "react-router-dom";
import type { NavigationSection } from "../../lib/authorization";
import { Wordmark } from "../brand/wordmark";

export type ShellUser = { name: string; email: string; roleLabel: string; scopeLabel: string | null };

type AppShellProps = {
  user: ShellUser;
  navigation: NavigationSection[];
  homeHref: string;
  onSignOut: () => void;
  /** Ends the user's sessions on every device. */
  onSignOutEverywhere?: () => void;
  signingOut?: boolean;
  busy?: boolean;
  children: ReactNode;
};

export function AppShell({ user, navigation, homeHref, onSignOut, onSignOutEverywhere, signingOut = false, busy = false, children }: AppShellProps) {
  return (
    <div className="flex min-h-screen">
      <a
        href="#main"
        className="sr-only z-50 rounded-md bg-surface px-3 py-2 text-stream-700 focus:not-sr-only focus:fixed focus:left-3 focus:top-3"
      >
        Skip to content
      </a>
      <header className="on-dark w-60 shrink-0 bg-ink-900 text-ink-100">
        <div className="sticky top-0 flex h-screen flex-col">
          <div className="px-5 pb-4 pt-5">
            <Link to={homeHref} aria-label="Tributary, go to your home screen" className="inline-block">
              <Wordmark tone="dark" />
            </Link>
          </div>
          <nav aria-label="Main" className="flex-1 overflow-y-auto px-3 pb-4">
            {navigation.map((section) => (
              <div key={section.section} className="mt-4 first:mt-1">
                <h2
                  id={`nav-${section.section}`}
                  className="px-2 pb-1 text-caption font-semibold uppercase tracking-wider text-ink-300"
                >
                  {section.label}
                </h2>
                <ul aria-labelledby={`nav-${section.section}`} className="space-y-0.5">
                  {section.items.map((item) => (
                    <li key={item.screen}>
                      <NavLink
                        to={item.href}
                        className={({ isActive }) =>
                          `block rounded-md border-l-[3px] px-2.5 py-1.5 text-small font-medium transition-colors ${
                            isActive
                              ? "border-silt-300 bg-ink-800 text-white"
                              : "border-transparent text-ink-100 hover:bg-ink-800/70 hover:text-white"
                          }`
                        }
                      >
                        {item.label}
                      </NavLink>
                    </li>
                  ))}
                </ul>
              </div>
            ))}
          </nav>
          <section aria-label="Your account" className="border-t border-ink-700 px-5 py-4">
            <p className="truncate text-small font-semibold text-white">{user.name}</p>
            <p className="truncate text-caption text-ink-300" title={user.email}>
              {user.email}
            </p>
            <p className="mt-2 inline-flex rounded-sm bg-ink-800 px-2 py-0.5 text-caption font-medium text-silt-300">
              {user.roleLabel}
            </p>
            {user.scopeLabel ? <p className="mt-1 text-caption text-ink-200">{user.scopeLabel}</p> : null}
            <button
              type="button"
              onClick={onSignOut}
              disabled={signingOut}
              className="mt-3 block w-full rounded-md border border-ink-600 px-3 py-1.5 text-small font-medium text-ink-50 hover:bg-ink-800 disabled:opacity-60"
            >
              {signingOut ? "Signing out…" : "Sign out"}
            </button>
            {onSignOutEverywhere ? (
              <button
                type="button"
                onClick={onSignOutEverywhere}
                disabled={signingOut}
                title="Ends your sessions in every browser and on every device"
                className="mt-1.5 block w-full rounded-md px-3 py-1 text-caption text-ink-200 underline-offset-2 hover:text-white hover:underline disabled:opacity-60"
              >
                Sign out everywhere
              </button>
            ) : null}
          </section>
        </div>
      </header>
      <div className="relative min-w-0 flex-1">
        {busy ? (
          <div
            role="progressbar"
            aria-label="Loading page"
            className="absolute inset-x-0 top-0 h-0.5 animate-pulse bg-stream-500"
          />
        ) : null}
        <main id="main" tabIndex={-1} className="mx-auto max-w-[78rem] px-10 py-8 focus:outline-none">
          {children}
        </main>
      </div>
    </div>
  );
}
