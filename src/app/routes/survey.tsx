/**
 * /surveys/:surveyId — one survey for the person who walks it: what it is, taking it offline (with
 * progress, the storage it uses and whether the browser promised to keep it), what is waiting to sync,
 * the reviewers' re-measure requests, and the way into capture.
 */
import { useEffect, useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import type { Role } from '@shared/schemas/common';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import {
  formatBytes,
  getStorageEstimate,
  isCaptureError,
  isStoragePersisted,
  pendingSummary,
  requestPersistentStorage,
  takeSurveyOffline,
  useOfflineSurvey,
  usePendingCounts,
  useRemeasureRequests,
  useSurveySummary,
  type PersistAnswer,
  type StorageEstimate,
  type TakeOfflineProgress,
  type TakeOfflineResult,
} from '@/features/capture/data';
import { useLiveQuery } from 'dexie-react-hooks';
import { db } from '@/db';
import { isApiRequestError } from '@/lib/api';
import { useOnlineStatus } from '@/lib/online-status';
import { useSignedIn } from './signed-in-layout';

const OFFLINE_ROLES: readonly Role[] = ['surveyor', 'reviewer', 'admin'];
/** Who sees the survey map link (the server also lets only the survey's own surveyors in). */
const MAP_ROLES: readonly Role[] = ['admin', 'reviewer', 'emc', 'surveyor'];
/** Who sees the review link (the review routes admit reviewers and admins). */
const REVIEW_LINK_ROLES: readonly Role[] = ['admin', 'reviewer'];
/** Who sees the EMC check link (every member may read it; these are the ones it is for). */
const EMC_LINK_ROLES: readonly Role[] = ['admin', 'reviewer', 'emc'];

const STATE_LABELS = { open: 'Open', submitted: 'Submitted for review', signed_off: 'Signed off' } as const;

const PERSIST_WORDS: Record<PersistAnswer, { tone: 'ok' | 'warning' | 'info'; text: string }> = {
  granted: { tone: 'ok', text: 'The browser agreed to keep Fringewalk’s data on this device until you remove it.' },
  denied: {
    tone: 'warning',
    text: 'The browser did not promise to keep this data: it may clear it when the device runs short of space. Sync as soon as you have a network.',
  },
  unsupported: { tone: 'info', text: 'This browser does not say whether it will keep offline data. Sync as soon as you have a network.' },
};

function formatWhen(iso: string): string {
  const d = new Date(iso);
  return Number.isNaN(d.getTime()) ? iso : d.toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'short' });
}

function StorageLine({ estimate, persist }: { estimate: StorageEstimate | null; persist: PersistAnswer | null }) {
  return (
    <div className="flex flex-col gap-2" data-testid="storage-status">
      <p>
        {estimate
          ? `Fringewalk uses ${formatBytes(estimate.usageBytes)} on this device${estimate.quotaBytes ? ` of ${formatBytes(estimate.quotaBytes)} the browser allows` : ''}.`
          : 'This browser does not report how much storage Fringewalk uses.'}
      </p>
      {persist && (
        <Alert tone={PERSIST_WORDS[persist].tone} title="Keeping the data">
          <span data-testid="persist-answer">{PERSIST_WORDS[persist].text}</span>
        </Alert>
      )}
    </div>
  );
}

export default function SurveyRoute() {
  const { surveyId = '' } = useParams();
  const { session, membership } = useSignedIn();
  const orgId = membership?.organisationId ?? '';
  const online = useOnlineStatus();
  const summary = useSurveySummary(orgId, surveyId);
  const offline = useOfflineSurvey(surveyId);
  const pending = usePendingCounts(surveyId);
  const remeasure = useRemeasureRequests(surveyId);
  const stationLabels = useLiveQuery(async () => {
    const rows = await db.stations.where('surveyId').equals(surveyId).toArray();
    return new Map(rows.map((s) => [s.id, s.label]));
  }, [surveyId]);

  const [progress, setProgress] = useState<TakeOfflineProgress | null>(null);
  const [result, setResult] = useState<TakeOfflineResult | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [estimate, setEstimate] = useState<StorageEstimate | null>(null);
  const [persist, setPersist] = useState<PersistAnswer | null>(null);

  useEffect(() => {
    let live = true;
    void Promise.all([getStorageEstimate(), isStoragePersisted()]).then(([e, p]) => {
      if (!live) return;
      setEstimate(e);
      setPersist((current) => current ?? (p === 'granted' ? p : null));
    });
    return () => {
      live = false;
    };
  }, [offline?.takenOfflineAt]);

  if (!membership) return <Alert title="You are not in an organisation yet">Ask an admin for an invitation.</Alert>;

  const busy = progress !== null && progress.done < progress.total;
  const mayTakeOffline = OFFLINE_ROLES.includes(membership.role);
  const name = summary.data?.name ?? offline?.survey.name;
  const state = summary.data?.state ?? offline?.survey.state;
  const siteName = summary.data?.siteName ?? offline?.site.name;

  async function takeOffline() {
    setError(null);
    setResult(null);
    setProgress({ step: 'Starting', done: 0, total: 1 });
    // Asked first, from the tap itself: some browsers only grant persistence in answer to a gesture.
    setPersist(await requestPersistentStorage());
    try {
      const got = await takeSurveyOffline({ orgId, surveyId, onProgress: setProgress });
      setResult(got);
      setEstimate(await getStorageEstimate());
    } catch (e) {
      setProgress(null);
      setError(isCaptureError(e) || isApiRequestError(e) ? e.message : 'The download failed. Try again.');
    }
  }

  if (!name) {
    if (summary.isPending && offline === undefined) return <p role="status">Loading the survey…</p>;
    if (summary.error && isApiRequestError(summary.error) && summary.error.status === 404) {
      return <Alert tone="danger" title="Survey not found">It may have been removed, or it belongs to another organisation.</Alert>;
    }
    if (offline === null && (summary.fetchStatus === 'paused' || !online.online)) {
      return <Alert tone="offline" title="This survey is not on this device">Open it once with a network and take it offline.</Alert>;
    }
    if (summary.error) return <Alert tone="danger" title="Could not load the survey">{isApiRequestError(summary.error) ? summary.error.message : 'Try again.'}</Alert>;
    return <p role="status">Loading the survey…</p>;
  }

  const requests = remeasure ? [...remeasure.entries()] : [];
  const waiting = pending ? pendingSummary(pending) : null;

  return (
    <div className="flex flex-col gap-8">
      <section aria-labelledby="survey-title" className="flex flex-col gap-2">
        <p className="text-fg-muted">{siteName}</p>
        <h1 id="survey-title" className="text-3xl font-bold">
          {name}
        </h1>
        <p>
          {state && <span className="font-bold">{STATE_LABELS[state]}</span>}
          {summary.data && (
            <>
              {' · '}
              {summary.data.stationCount} stations · {summary.data.readingCount} readings on the server
            </>
          )}
          {summary.data?.assignedToMe && ' · assigned to you'}
        </p>
        <p className="text-fg-muted">Signed in as {session.user.name || session.user.email}.</p>
      </section>

      <section aria-labelledby="capture-title" className="flex flex-col gap-3">
        <h2 id="capture-title" className="sr-only">
          Capture
        </h2>
        <Link
          to={`/surveys/${surveyId}/capture`}
          className="inline-flex min-h-20 items-center justify-center rounded-xl bg-accent px-8 text-2xl font-bold text-accent-fg no-underline hover:bg-accent-hover"
          data-testid="start-capture"
        >
          Start capture
        </Link>
        {offline === null && <p className="text-fg-muted">Take the survey offline first: capture works from the copy on this device.</p>}
      </section>

      {MAP_ROLES.includes(membership.role) && (
        <Link to={`/surveys/${surveyId}/map`} className="inline-flex min-h-touch items-center self-start font-bold" data-testid="open-survey-map">
          Open the survey map
        </Link>
      )}

      {REVIEW_LINK_ROLES.includes(membership.role) && (
        <Link to={`/surveys/${surveyId}/review`} className="inline-flex min-h-touch items-center self-start font-bold" data-testid="open-review">
          Review and sign off
        </Link>
      )}
      {EMC_LINK_ROLES.includes(membership.role) && (
        <Link to={`/surveys/${surveyId}/emc`} className="inline-flex min-h-touch items-center self-start font-bold" data-testid="open-emc">
          EMC check: lines in watched bands
        </Link>
      )}
      <Link to={`/surveys/${surveyId}/report`} className="inline-flex min-h-touch items-center self-start font-bold" data-testid="open-survey-report">
        Survey report
      </Link>

      <section aria-labelledby="offline-title" className="flex flex-col gap-3 rounded-xl border border-border bg-surface p-4">
        <h2 id="offline-title" className="text-xl font-bold">
          On this device
        </h2>
        {offline ? (
          <p data-testid="offline-status">
            Taken offline {formatWhen(offline.takenOfflineAt)}: {offline.levels.length} {offline.levels.length === 1 ? 'level' : 'levels'},{' '}
            {offline.rooms.length} rooms, {offline.instruments.length} instruments ({formatBytes(offline.survey.bytes)} downloaded).
          </p>
        ) : offline === null ? (
          <p data-testid="offline-status">Not on this device yet.</p>
        ) : null}
        {mayTakeOffline ? (
          <div className="flex flex-col gap-3">
            <Button onClick={() => void takeOffline()} busy={busy} busyLabel="Downloading…" disabled={!online.online} data-testid="take-offline" className="self-start">
              {offline ? 'Download again' : 'Take offline'}
            </Button>
            {!online.online && <p className="text-fg-muted">Taking a survey offline needs a network.</p>}
            {progress && (
              <div className="flex flex-col gap-1">
                <label htmlFor="take-offline-progress">
                  {progress.step} ({progress.done} of {progress.total})
                </label>
                <progress id="take-offline-progress" className="h-4 w-full accent-accent" max={progress.total} value={progress.done} data-testid="take-offline-progress" />
              </div>
            )}
            {result && (
              <Alert tone="ok" title="Ready to work offline">
                {formatBytes(result.bytes)} saved on this device.
              </Alert>
            )}
            {result && result.missingPlanImages.length > 0 && (
              <Alert tone="warning" title="Some plan images are missing">
                <ul className="list-disc pl-5">
                  {result.missingPlanImages.map((m) => (
                    <li key={m.planId}>
                      {m.levelName}: {m.reason} Stations are still shown, without the plan behind them.
                    </li>
                  ))}
                </ul>
              </Alert>
            )}
            {error && (
              <Alert tone="danger" title="Could not take the survey offline">
                {error}
              </Alert>
            )}
          </div>
        ) : (
          <p className="text-fg-muted">Your role reads surveys on the server; taking them offline is for surveyors, reviewers and admins.</p>
        )}
        <StorageLine estimate={estimate} persist={persist} />
      </section>

      <section aria-labelledby="sync-title" className="flex flex-col gap-2">
        <h2 id="sync-title" className="text-xl font-bold">
          Waiting to sync
        </h2>
        <p data-testid="survey-pending">{pending === undefined ? 'Counting…' : (waiting ?? 'Nothing from this device is waiting to sync.')}</p>
        {pending && pending.rejected > 0 && (
          <Alert tone="danger" title="Refused by the server">
            {pending.rejected} {pending.rejected === 1 ? 'record needs' : 'records need'} fixing before they can sync.
          </Alert>
        )}
      </section>

      <section aria-labelledby="remeasure-title" className="flex flex-col gap-2">
        <h2 id="remeasure-title" className="text-xl font-bold">
          Re-measure requests
        </h2>
        {requests.length === 0 ? (
          <p className="text-fg-muted">{offline ? 'No re-measure requests.' : 'Re-measure requests appear here once the survey is on this device.'}</p>
        ) : (
          <ul className="flex flex-col gap-2" data-testid="remeasure-list">
            {requests.map(([stationId, decisions]) => (
              <li key={stationId} className="rounded-lg border-l-8 border-warning bg-warning-soft px-4 py-2">
                <p className="font-bold">Station {stationLabels?.get(stationId) ?? stationId.slice(0, 8)}</p>
                {decisions.map((d) => (
                  <p key={d.id}>
                    {d.note} <span className="text-fg-muted">({formatWhen(d.decidedAt)})</span>
                  </p>
                ))}
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}
