import type { ReactNode } from 'react';
import { OfflineIndicator } from '../offline-indicator';
import { ThemeToggle } from '../theme-toggle';
import { BrandMark } from './brand-mark';
import { SafetyFooter } from './safety-footer';

/** The frame for screens seen before signing in: brand, connection state, theme, one card. */
export function PublicLayout({ title, children }: { title: string; children: ReactNode }) {
  return (
    <div className="flex min-h-dvh flex-col">
      <header className="bg-header text-header-fg">
        <div className="mx-auto flex max-w-5xl flex-wrap items-center gap-3 px-4 py-2">
          <span className="flex items-center gap-2 text-xl font-bold">
            <BrandMark className="h-10 w-10" />
            Fringewalk
          </span>
          <div className="ml-auto flex flex-wrap items-center gap-3">
            <OfflineIndicator />
            <ThemeToggle />
          </div>
        </div>
      </header>
      <main className="mx-auto w-full max-w-lg flex-1 px-4 py-8">
        <div className="rounded-xl border border-border bg-surface p-6 shadow-sm">
          <h1 className="mb-4 text-2xl font-bold">{title}</h1>
          {children}
        </div>
      </main>
      <SafetyFooter />
    </div>
  );
}
