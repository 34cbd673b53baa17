import { useState } from 'react';
import type { Level } from '@shared/schemas/site';
import type { Source } from '@shared/schemas/source';
import { formatFluxDensity, formatLength } from '@shared/units';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { useDeleteSource } from '../data/delete-source';
import { useSources } from '../data/list-sources';
import { ConfirmButton } from '@/components/confirm-button';
import { QueryState } from './query-state';
import { SourceForm } from './source-form';
import { SHIELDING_LABELS, SOURCE_KIND_LABELS, SOURCE_STATE_LABELS } from './labels';
import { EmptyState } from '@/components/empty-state';

function position(source: Source, levels: Level[]): string {
  const level = levels.find((l) => l.id === source.levelId);
  if (!level) return 'Not on a plan yet';
  if (source.xM === null || source.yM === null) return `${level.name}, not placed on the plan yet`;
  return `${level.name}, x ${formatLength(Math.abs(source.xM), { unit: 'm', significantDigits: 3 })}${source.xM < 0 ? ' left' : ''}, y ${formatLength(Math.abs(source.yM), { unit: 'm', significantDigits: 3 })}${source.yM < 0 ? ' down' : ''} from the origin`;
}

export function SourcesSection({ organisationId, siteId, levels, canEdit }: { organisationId: string; siteId: string; levels: Level[]; canEdit: boolean }) {
  const sources = useSources(organisationId, siteId);
  const remove = useDeleteSource(organisationId, siteId);
  const [editing, setEditing] = useState<string | 'new' | null>(null);
  const list = sources.data?.sources ?? [];
  return (
    <section aria-labelledby="sources-heading" className="flex flex-col gap-3">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h2 id="sources-heading" className="text-2xl font-bold">
          Magnets
        </h2>
        {canEdit && editing === null && <Button onClick={() => setEditing('new')}>Add magnet</Button>}
      </div>
      {editing === 'new' && (
        <div className="rounded-xl border border-border bg-surface p-4">
          <SourceForm organisationId={organisationId} siteId={siteId} levels={levels} onDone={() => setEditing(null)} />
        </div>
      )}
      {!sources.data ? (
        <QueryState label="magnets" query={sources} />
      ) : list.length === 0 ? (
        <EmptyState title="No magnets yet">
          {canEdit
            ? 'Add each MRI, NMR, cyclotron or test magnet as a source, then place it on its plan (its centre is the dipole centre).'
            : 'An admin or reviewer adds the magnet sources of this site.'}
        </EmptyState>
      ) : (
        <ul className="grid grid-cols-1 gap-3 md:grid-cols-2" aria-label="Magnets">
          {list.map((source) =>
            editing === source.id ? (
              <li key={source.id} className="rounded-xl border border-border bg-surface p-4 md:col-span-2">
                <SourceForm organisationId={organisationId} siteId={siteId} levels={levels} source={source} onDone={() => setEditing(null)} />
              </li>
            ) : (
              <li key={source.id} className="rounded-xl border border-border bg-surface p-4" data-testid="source-card">
                <h3 className="text-lg font-bold">{source.name}</h3>
                <p>
                  {SOURCE_KIND_LABELS[source.kind]} · {formatFluxDensity(source.nominalFieldT, { significantDigits: 3 })} ·{' '}
                  {SOURCE_STATE_LABELS[source.state]} · {SHIELDING_LABELS[source.shielding]}
                </p>
                <p className="text-sm text-fg-muted">{position(source, levels)}</p>
                {canEdit && (
                  <div className="mt-2 flex flex-wrap gap-2">
                    <Button variant="secondary" onClick={() => setEditing(source.id)}>
                      Edit
                    </Button>
                    <ConfirmButton
                      title={`Delete ${source.name}?`}
                      body="The magnet is removed from the site. Readings already taken keep their values."
                      confirmLabel="Delete magnet"
                      busy={remove.isPending && remove.variables === source.id}
                      onConfirm={() => remove.mutate(source.id)}
                    >
                      Delete
                    </ConfirmButton>
                  </div>
                )}
              </li>
            ),
          )}
        </ul>
      )}
      {list.some((s) => s.state === 'at_field') && (
        <Alert tone="warning" title="Near strong magnets">
          Use non-magnetic tools only. Zone lines differ by jurisdiction and by implant: Fringewalk supports, and does not replace, the site's MR safety
          officer and local codes.
        </Alert>
      )}
    </section>
  );
}
