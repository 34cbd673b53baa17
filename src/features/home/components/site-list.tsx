import type { Role } from '@shared/schemas/common';
import type { SiteSummary } from '@shared/schemas/home';
import { EmptyState } from '@/components/empty-state';

/** Who may add sites (the Site setup screen admits admins and reviewers). */
const SITE_EDITORS: readonly Role[] = ['admin', 'reviewer'];

export function SiteList({ sites, role }: { sites: SiteSummary[]; role: Role }) {
  if (sites.length === 0) {
    return SITE_EDITORS.includes(role) ? (
      <EmptyState title="No sites in this organisation yet" action={{ to: '/sites', label: 'Add the first site' }}>
        A site is a campus or building with its magnets: add it, then its levels, plans and rooms.
      </EmptyState>
    ) : (
      <EmptyState title="No sites in this organisation yet">An admin or reviewer adds the sites; they appear here.</EmptyState>
    );
  }
  return (
    <ul className="grid gap-3 md:grid-cols-2" aria-label="Sites">
      {sites.map((site) => (
        <li key={site.id} className="rounded-xl border border-border bg-surface p-4" data-testid="site-card">
          <div className="flex flex-wrap items-start justify-between gap-2">
            <h3 className="text-lg font-bold leading-snug">{site.name}</h3>
            {site.archived && <span className="rounded-full bg-surface-sunken px-3 py-1 text-sm font-bold text-fg-muted">Archived</span>}
          </div>
          {site.address && <p className="text-fg-muted">{site.address}</p>}
          <p className="mt-2 text-sm">
            {site.levelCount} {site.levelCount === 1 ? 'level' : 'levels'} · {site.sourceCount}{' '}
            {site.sourceCount === 1 ? 'magnet source' : 'magnet sources'}
          </p>
        </li>
      ))}
    </ul>
  );
}
