import type { SyncConflict } from '@shared/schemas/sync';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { isApiRequestError } from '@/lib/api';
import { useResolveConflict, useSurveyConflicts } from '../data/survey-conflicts';

const KIND_WORDS: Record<SyncConflict['kind'], string> = {
  edit_vs_edit: 'Two devices edited the same record',
  edit_vs_delete: 'A device edited a record another had deleted (the edit is shown now)',
  delete_vs_edit: 'A device deleted a record another had edited',
};
const HIDDEN = new Set(['id', 'organisationId', 'surveyId', 'changeSeq', 'createdAt', 'updatedAt', 'conflicted', 'attachmentPending']);

function show(value: unknown): string {
  if (value === null || value === undefined) return '—';
  if (typeof value === 'object') return JSON.stringify(value);
  return String(value);
}

function Versions({ conflict }: { conflict: SyncConflict }) {
  const keys = [...new Set([...Object.keys(conflict.serverVersion), ...Object.keys(conflict.incomingVersion)])].filter((k) => !HIDDEN.has(k));
  return (
    <div className="overflow-x-auto">
      <table className="w-full min-w-[32rem] border-collapse text-left text-sm">
        <caption className="sr-only">Both revisions of the record, field by field</caption>
        <thead>
          <tr>
            <th scope="col" className="px-2 py-1">
              Field
            </th>
            <th scope="col" className="px-2 py-1">
              On the server (revision {conflict.serverRevision})
            </th>
            <th scope="col" className="px-2 py-1">
              From the device (from revision {conflict.incomingBaseRevision})
            </th>
          </tr>
        </thead>
        <tbody>
          {keys.map((k) => {
            const a = show(conflict.serverVersion[k]);
            const b = show(conflict.incomingVersion[k]);
            return (
              <tr key={k} className={`border-t border-border ${a !== b ? 'bg-warning-soft font-bold' : ''}`}>
                <th scope="row" className="px-2 py-1 font-normal">
                  {k}
                </th>
                <td className="px-2 py-1 break-all">{a}</td>
                <td className="px-2 py-1 break-all">{b}</td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}

/** The survey's open sync conflicts, both revisions side by side, and the reviewer's choice. */
export function ConflictsPanel({ organisationId, surveyId, readOnly }: { organisationId: string; surveyId: string; readOnly: boolean }) {
  const conflicts = useSurveyConflicts(organisationId, surveyId);
  const resolve = useResolveConflict(organisationId, surveyId);
  const list = conflicts.data?.conflicts ?? [];
  return (
    <section aria-labelledby="conflicts-title" className="flex flex-col gap-3" data-testid="conflicts-panel">
      <h2 id="conflicts-title" className="text-xl font-bold">
        Sync conflicts {list.length > 0 && `(${list.length})`}
      </h2>
      {conflicts.isPending && <p role="status">Loading the conflicts…</p>}
      {conflicts.error && <Alert tone="danger" title="Could not load the conflicts">{isApiRequestError(conflicts.error) ? conflicts.error.message : 'Try again.'}</Alert>}
      {conflicts.data && list.length === 0 && <p className="text-fg-muted">No open conflicts.</p>}
      {resolve.error && <Alert tone="danger" title="Not resolved">{isApiRequestError(resolve.error) ? resolve.error.message : 'Try again.'}</Alert>}
      {list.map((c) => (
        <article key={c.id} className="flex flex-col gap-2 rounded-xl border-l-8 border-warning bg-surface p-3" data-testid="conflict">
          <p className="font-bold">
            {KIND_WORDS[c.kind]} · {c.entity.replace('_', ' ')} {c.recordId.slice(0, 8)} · device {c.deviceId}
          </p>
          <Versions conflict={c} />
          {!readOnly && (
            <div className="flex flex-wrap gap-3">
              <Button variant="secondary" busy={resolve.isPending && resolve.variables?.conflictId === c.id} onClick={() => resolve.mutate({ conflictId: c.id, choose: 'server' })}>
                Choose the server’s revision
              </Button>
              <Button variant="secondary" busy={resolve.isPending && resolve.variables?.conflictId === c.id} onClick={() => resolve.mutate({ conflictId: c.id, choose: 'incoming' })}>
                Choose the device’s revision
              </Button>
            </div>
          )}
        </article>
      ))}
    </section>
  );
}
