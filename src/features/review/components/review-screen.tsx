/**
 * The reviewer's screen for one survey: every reading in a virtualised table with a unit picker,
 * filters and a search over notes; bulk accept / re-measure (with a note) / reject (with a reason); the
 * survey's sync conflicts; submit, sign-off and reopen with the reasons sign-off is blocked; the CSV
 * export and import.
 */
import type { ReviewSelection } from './review-table';
import { useDeferredValue, useId, useMemo, useState } from 'react';
import { FIELD_UNITS, type VERDICTS } from '@shared/schemas/vocabulary';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { isApiRequestError } from '@/lib/api';
import { showToast } from '@/lib/toast';
import { useDecideReadings } from '../data/decide-readings';
import { readingsCsvUrl } from '../data/get-report';
import { useReviewReadings } from '../data/get-review-readings';
import { EMPTY_FILTER, filterRows, searchText, type FieldUnit, type ReviewFilter } from '../lib/review-rows';
import { ConflictsPanel } from './conflicts-panel';
import { ImportPanel } from './import-panel';
import { EmptyState } from '@/components/empty-state';
import { ReviewTable } from './review-table';
import { SignOffPanel } from './sign-off-panel';

type Verdict = (typeof VERDICTS)[number];

const selectClass = 'min-h-touch max-w-full rounded-lg border-2 border-field-border bg-surface px-2 text-base text-fg';

function Select({ label, value, onChange, children, testId }: { label: string; value: string; onChange: (v: string) => void; children: React.ReactNode; testId?: string }) {
  const id = useId();
  return (
    <div className="flex min-w-0 max-w-full flex-col gap-1">
      <label htmlFor={id} className="text-sm font-bold">
        {label}
      </label>
      <select id={id} value={value} onChange={(e) => onChange(e.target.value)} className={selectClass} data-testid={testId}>
        {children}
      </select>
    </div>
  );
}

export interface ReviewScreenProps {
  organisationId: string;
  surveyId: string;
  /** Reviewers and admins decide; others see the state only. */
  canReview: boolean;
  /** Links to the report and the map, composed by the route. */
  links?: React.ReactNode;
}

export function ReviewScreen({ organisationId, surveyId, canReview, links }: ReviewScreenProps) {
  const query = useReviewReadings(organisationId, surveyId);
  const decide = useDecideReadings(organisationId, surveyId);
  const [unit, setUnit] = useState<FieldUnit>('mT');
  const [filter, setFilter] = useState<ReviewFilter>(EMPTY_FILTER);
  const deferredFilter = useDeferredValue(filter);
  const [selection, setSelection] = useState<ReviewSelection>({});
  const [pending, setPending] = useState<Exclude<Verdict, 'accepted'> | null>(null);
  const [note, setNote] = useState('');
  const [noteError, setNoteError] = useState<string | null>(null);
  const searchId = useId();

  const rows = useMemo(() => query.data?.readings ?? [], [query.data]);
  const index = useMemo(() => new Map(rows.map((r) => [r.id, searchText(r)])), [rows]);
  const shown = useMemo(() => filterRows(rows, deferredFilter, index), [rows, deferredFilter, index]);
  const levels = useMemo(() => [...new Map(rows.map((r) => [r.levelId, r.levelName])).entries()], [rows]);
  const surveyors = useMemo(() => [...new Map(rows.map((r) => [r.surveyorUserId, r.surveyorName])).entries()], [rows]);
  const shownIds = useMemo(() => new Set(shown.map((r) => r.id)), [shown]);
  const selectedIds = Object.keys(selection).filter((id) => selection[id] && shownIds.has(id));

  if (query.isPending) return <p role="status">Loading the readings…</p>;
  if (query.error) {
    const e = query.error;
    return (
      <Alert tone="danger" title={isApiRequestError(e) && e.status === 404 ? 'Survey not found' : 'Could not load the readings'}>
        {isApiRequestError(e) ? e.message : 'Try again.'}
      </Alert>
    );
  }
  const { status, zoneSet } = query.data;
  const readOnly = !canReview || status.state === 'signed_off';
  const counts = {
    undecided: rows.filter((r) => !r.decision).length,
    remeasure: rows.filter((r) => r.decision?.verdict === 'remeasure').length,
    conflicted: rows.filter((r) => r.conflicted).length,
  };
  const set = <K extends keyof ReviewFilter>(key: K, value: ReviewFilter[K]) => setFilter((f) => ({ ...f, [key]: value }));

  function run(verdict: Verdict, text?: string) {
    decide.mutate(
      { readingIds: selectedIds, verdict, ...(text ? { note: text } : {}) },
      {
        onSuccess: (out) => {
          setSelection({});
          setPending(null);
          setNote('');
          showToast({ tone: 'ok', message: `${out.decided} ${out.decided === 1 ? 'reading' : 'readings'} decided${out.unchanged ? `, ${out.unchanged} already so` : ''}.` });
        },
      },
    );
  }

  return (
    <div className="flex flex-col gap-6">
      <header className="flex flex-col gap-1">
        <p className="text-fg-muted">{status.siteName}</p>
        <h1 className="text-3xl font-bold">Review: {status.name}</h1>
        <p>
          {rows.length} readings and sweeps · {counts.undecided} undecided · {counts.remeasure} waiting for re-measure · {counts.conflicted} in conflict
          {zoneSet && ` · classes by ${zoneSet.name}`}
        </p>
        <div className="flex flex-wrap gap-4">
          {links}
          <a href={readingsCsvUrl(organisationId, surveyId)} download className="inline-flex min-h-touch items-center font-bold" data-testid="download-csv">
            Download readings (CSV)
          </a>
        </div>
      </header>

      <SignOffPanel organisationId={organisationId} status={status} canReview={canReview} />

      <section aria-labelledby="readings-title" className="flex flex-col gap-3">
        <h2 id="readings-title" className="text-xl font-bold">
          Readings
        </h2>
        <div className="flex flex-wrap items-end gap-3">
          <div className="flex min-w-64 flex-1 flex-col gap-1">
            <label htmlFor={searchId} className="text-sm font-bold">
              Search notes
            </label>
            <input
              id={searchId}
              type="search"
              value={filter.search}
              onChange={(e) => set('search', e.target.value)}
              placeholder="Words in notes, stations, rooms, people"
              className="min-h-touch rounded-lg border-2 border-field-border bg-surface px-3 text-lg text-fg"
              data-testid="review-search"
            />
          </div>
          <Select label="Decision" value={filter.decision} onChange={(v) => set('decision', v as ReviewFilter['decision'])} testId="filter-decision">
            <option value="all">All</option>
            <option value="undecided">Undecided</option>
            <option value="accepted">Accepted</option>
            <option value="remeasure">Re-measure</option>
            <option value="rejected">Rejected</option>
          </Select>
          <Select label="Kind" value={filter.kind} onChange={(v) => set('kind', v as ReviewFilter['kind'])}>
            <option value="all">Readings and sweeps</option>
            <option value="field_reading">Field readings</option>
            <option value="sweep">Sweeps</option>
          </Select>
          <Select label="Level" value={filter.levelId} onChange={(v) => set('levelId', v)}>
            <option value="all">All levels</option>
            {levels.map(([id, name]) => (
              <option key={id} value={id}>
                {name}
              </option>
            ))}
          </Select>
          <Select label="Surveyor" value={filter.surveyorUserId} onChange={(v) => set('surveyorUserId', v)}>
            <option value="all">Everyone</option>
            {surveyors.map(([id, name]) => (
              <option key={id} value={id}>
                {name}
              </option>
            ))}
          </Select>
          <Select label="Sync" value={filter.sync} onChange={(v) => set('sync', v as ReviewFilter['sync'])}>
            <option value="all">Any</option>
            <option value="conflicted">In conflict</option>
            <option value="attachment_pending">Attachment missing</option>
            <option value="clean">Synced</option>
          </Select>
          {zoneSet && (
            <Select label="Class at least" value={String(filter.minClassIndex)} onChange={(v) => set('minClassIndex', Number(v))}>
              <option value="-1">Any</option>
              {zoneSet.thresholds.map((t, i) => (
                <option key={t.name} value={i}>
                  {t.name}
                </option>
              ))}
            </Select>
          )}
          <Select label="Unit" value={unit} onChange={(v) => setUnit(v as FieldUnit)} testId="unit-picker">
            {FIELD_UNITS.map((u) => (
              <option key={u} value={u}>
                {u}
              </option>
            ))}
          </Select>
          <Button variant="quiet" onClick={() => setFilter(EMPTY_FILTER)}>
            Clear filters
          </Button>
        </div>
        <p role="status" data-testid="review-count">
          Showing {shown.length} of {rows.length}
          {selectedIds.length > 0 && ` · ${selectedIds.length} selected`}
        </p>

        {!readOnly && (
          <div className="flex flex-col gap-2 rounded-xl border border-border bg-surface-sunken p-3" data-testid="bulk-actions">
            <div className="flex flex-wrap gap-3">
              <Button disabled={selectedIds.length === 0} busy={decide.isPending && decide.variables?.verdict === 'accepted'} busyLabel="Accepting…" onClick={() => run('accepted')} data-testid="accept-selected">
                Accept {selectedIds.length || ''}
              </Button>
              <Button variant="secondary" disabled={selectedIds.length === 0} onClick={() => (setPending('remeasure'), setNoteError(null))} data-testid="remeasure-selected">
                Re-measure…
              </Button>
              <Button variant="secondary" disabled={selectedIds.length === 0} onClick={() => (setPending('rejected'), setNoteError(null))} data-testid="reject-selected">
                Reject…
              </Button>
              {selectedIds.length > 0 && (
                <Button variant="quiet" onClick={() => setSelection({})}>
                  Clear selection
                </Button>
              )}
            </div>
            {pending && (
              <form
                className="flex flex-col gap-2"
                onSubmit={(e) => {
                  e.preventDefault();
                  if (!note.trim()) return setNoteError(pending === 'remeasure' ? 'Say what to re-measure: the surveyor sees it at the station.' : 'Give the reason for rejecting.');
                  run(pending, note.trim());
                }}
              >
                <label htmlFor="decision-note" className="font-bold">
                  {pending === 'remeasure' ? 'What should the surveyor re-measure?' : 'Why are these readings rejected?'}
                </label>
                <textarea
                  id="decision-note"
                  value={note}
                  rows={2}
                  onChange={(e) => (setNote(e.target.value), setNoteError(null))}
                  aria-invalid={noteError ? true : undefined}
                  aria-describedby={noteError ? 'decision-note-error' : undefined}
                  className="rounded-lg border-2 border-field-border bg-surface px-3 py-2 text-lg text-fg"
                  data-testid="decision-note"
                />
                {noteError && (
                  <p id="decision-note-error" className="text-sm font-bold text-danger">
                    {noteError}
                  </p>
                )}
                <div className="flex gap-3">
                  <Button type="submit" busy={decide.isPending} busyLabel="Saving…" data-testid="confirm-decision">
                    {pending === 'remeasure' ? `Ask for re-measure (${selectedIds.length})` : `Reject ${selectedIds.length}`}
                  </Button>
                  <Button variant="secondary" onClick={() => setPending(null)}>
                    Cancel
                  </Button>
                </div>
              </form>
            )}
            {decide.error && (
              <Alert tone="danger" title="Not decided">
                {isApiRequestError(decide.error) ? decide.error.message : 'Try again.'}
              </Alert>
            )}
          </div>
        )}
        {rows.length === 0 ? (
          <EmptyState title="No readings in this survey yet" action={{ to: `/surveys/${surveyId}/capture`, label: 'Go to capture' }}>
            Surveyors’ field readings and sweeps appear here once their walks sync.{canReview && status.state === 'open' ? ' Readings taken on another instrument can be imported below.' : ''}
          </EmptyState>
        ) : (
          <ReviewTable rows={shown} unit={unit} classCount={zoneSet?.thresholds.length ?? 0} selection={selection} onSelectionChange={setSelection} readOnly={readOnly} />
        )}
      </section>

      <ConflictsPanel organisationId={organisationId} surveyId={surveyId} readOnly={readOnly} />
      {canReview && status.state === 'open' && <ImportPanel organisationId={organisationId} surveyId={surveyId} />}
    </div>
  );
}
