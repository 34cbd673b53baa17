import type { SiteSummary } from '@shared/schemas/home';

export function SiteList({ sites }: { sites: SiteSummary[] }) {
  if (sites.length === 0) return <p className="text-fg-muted">No sites in this organisation yet.</p>;
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
