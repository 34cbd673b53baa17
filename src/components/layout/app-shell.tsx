import type { ReactNode } from 'react';
import { NavLink } from 'react-router-dom';
import { Button } from '../button';
import { OfflineIndicator } from '../offline-indicator';
import { ThemeToggle } from '../theme-toggle';
import { BrandMark } from './brand-mark';
import { SafetyFooter } from './safety-footer';

export interface ShellNavItem {
  to: string;
  label: string;
  end?: boolean;
}

export interface AppShellProps {
  navItems: ShellNavItem[];
  userName: string;
  roleLabel: string | null;
  /** The organisation name, or a switcher when the user has several. */
  organisation: ReactNode;
  onSignOut: () => void;
  signingOut: boolean;
  notices?: ReactNode;
  /** Sync state shown beside the connection state ("14 readings not yet synced"). */
  syncStatus?: ReactNode;
  children: ReactNode;
}

/** The signed-in frame: brand, connection state, theme, navigation, who is signed in, and sign-out. */
export function AppShell({ navItems, userName, roleLabel, organisation, onSignOut, signingOut, notices, syncStatus, children }: AppShellProps) {
  return (
    <div className="flex min-h-dvh flex-col">
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:rounded focus:bg-surface focus:p-3">
        Skip to content
      </a>
      <header className="bg-header text-header-fg">
        <div className="mx-auto flex max-w-5xl flex-wrap items-center gap-3 px-4 py-2">
          <NavLink to="/" className="flex min-h-touch items-center gap-2 text-xl font-bold text-header-fg no-underline">
            <BrandMark className="h-10 w-10" />
            Fringewalk
          </NavLink>
          <div className="ml-auto flex flex-wrap items-center gap-3">
            <OfflineIndicator />
            {syncStatus}
            <ThemeToggle />
          </div>
        </div>
        <div className="mx-auto flex max-w-5xl flex-wrap items-center gap-x-6 gap-y-2 border-t border-white/15 px-4 py-2">
          <nav aria-label="Main">
            <ul className="flex flex-wrap gap-2">
              {navItems.map((item) => (
                <li key={item.to}>
                  <NavLink
                    to={item.to}
                    end={item.end}
                    className={({ isActive }) =>
                      `inline-flex min-h-touch items-center rounded-lg px-4 font-bold text-header-fg no-underline hover:bg-white/10 ${
                        isActive ? 'bg-white/15 underline decoration-2 underline-offset-4' : ''
                      }`
                    }
                  >
                    {item.label}
                  </NavLink>
                </li>
              ))}
            </ul>
          </nav>
          <div className="flex w-full items-center justify-between gap-3 sm:ml-auto sm:w-auto sm:justify-end" data-testid="signed-in-user">
            <div className="min-w-0 flex-1 text-sm leading-tight sm:flex-none">
              <p>
                <span className="font-bold">{userName}</span>
                {roleLabel && <span className="text-header-muted"> · {roleLabel}</span>}
              </p>
              {organisation}
            </div>
            <Button variant="on-header" className="shrink-0" onClick={onSignOut} busy={signingOut} busyLabel="Signing out…">
              Sign out
            </Button>
          </div>
        </div>
      </header>
      {notices && <div className="mx-auto w-full max-w-5xl space-y-2 px-4 pt-4">{notices}</div>}
      <main id="main" className="mx-auto w-full max-w-5xl flex-1 px-4 py-6">
        {children}
      </main>
      <SafetyFooter />
    </div>
  );
}
