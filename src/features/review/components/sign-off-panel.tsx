import { useState } from 'react';
import type { ReviewStatus } from '@shared/schemas/review';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { isApiRequestError } from '@/lib/api';
import { useChangeSurveyState } from '../data/change-survey-state';

const STATE_WORDS = { open: 'Open for capture', submitted: 'Submitted for review', signed_off: 'Signed off' } as const;

function when(iso: string | null) {
  return iso ? new Date(iso).toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'short' }) : '';
}

/** Where the survey stands, why it cannot be signed off yet, and the submit / sign-off / reopen actions. */
export function SignOffPanel({ organisationId, status, canReview }: { organisationId: string; status: ReviewStatus; canReview: boolean }) {
  const change = useChangeSurveyState(organisationId, status.surveyId);
  const [reopening, setReopening] = useState(false);
  const [reason, setReason] = useState('');
  const [reasonError, setReasonError] = useState<string | null>(null);
  const blockers = status.signOffBlockers.filter((b) => b.code !== 'signed_off' && b.code !== 'not_submitted');
  const error = change.error && isApiRequestError(change.error) ? change.error.message : change.error ? 'The request failed. Try again.' : null;

  return (
    <section aria-labelledby="sign-off-title" className="flex flex-col gap-3 rounded-xl border border-border bg-surface p-4" data-testid="sign-off-panel">
      <h2 id="sign-off-title" className="text-xl font-bold">
        Sign-off
      </h2>
      <p>
        <span className="font-bold" data-testid="survey-state">
          {STATE_WORDS[status.state]}
        </span>
        {status.submittedAt && status.submittedBy && ` · submitted by ${status.submittedBy.name} ${when(status.submittedAt)}`}
        {status.signedOffAt && status.signedOffBy && ` · signed off by ${status.signedOffBy.name} ${when(status.signedOffAt)}`}
      </p>
      {status.reportSha256 && (
        <p className="break-all text-sm">
          Report data SHA-256: <code data-testid="report-sha256">{status.reportSha256}</code>
        </p>
      )}
      {status.state !== 'signed_off' && blockers.length > 0 && (
        <Alert tone="warning" title="Sign-off is blocked">
          <ul className="list-disc pl-5" data-testid="sign-off-blockers">
            {blockers.map((b) => (
              <li key={b.code}>{b.message}</li>
            ))}
          </ul>
        </Alert>
      )}
      {status.state === 'open' && <p className="text-fg-muted">Submitting stops capture: devices can no longer push readings into the survey until it is reopened.</p>}
      {error && (
        <Alert tone="danger" title="Not done">
          {error}
        </Alert>
      )}
      <div className="flex flex-wrap gap-3">
        {status.state === 'open' && (
          <Button onClick={() => change.mutate({ action: 'submit' })} busy={change.isPending} busyLabel="Submitting…" data-testid="submit-survey">
            Submit for review
          </Button>
        )}
        {status.state === 'submitted' && canReview && (
          <Button onClick={() => change.mutate({ action: 'sign-off' })} disabled={blockers.length > 0} busy={change.isPending} busyLabel="Signing off…" data-testid="sign-off">
            Sign off
          </Button>
        )}
        {status.state !== 'open' && canReview && !reopening && (
          <Button variant="secondary" onClick={() => setReopening(true)} data-testid="reopen">
            Reopen…
          </Button>
        )}
      </div>
      {reopening && (
        <form
          className="flex flex-col gap-2"
          onSubmit={(e) => {
            e.preventDefault();
            if (!reason.trim()) {
              setReasonError('Say why the survey is reopened; it is kept in the audit log.');
              return;
            }
            change.mutate({ action: 'reopen', reason: reason.trim() }, { onSuccess: () => (setReopening(false), setReason('')) });
          }}
        >
          <label htmlFor="reopen-reason" className="font-bold">
            Why reopen it?
          </label>
          <textarea
            id="reopen-reason"
            value={reason}
            onChange={(e) => (setReason(e.target.value), setReasonError(null))}
            rows={2}
            aria-invalid={reasonError ? true : undefined}
            aria-describedby={reasonError ? 'reopen-reason-error' : undefined}
            className="rounded-lg border-2 border-field-border bg-surface px-3 py-2 text-lg text-fg"
          />
          {reasonError && (
            <p id="reopen-reason-error" className="text-sm font-bold text-danger">
              {reasonError}
            </p>
          )}
          <div className="flex gap-3">
            <Button type="submit" busy={change.isPending} busyLabel="Reopening…">
              Reopen the survey
            </Button>
            <Button variant="secondary" onClick={() => setReopening(false)}>
              Cancel
            </Button>
          </div>
        </form>
      )}
    </section>
  );
}
