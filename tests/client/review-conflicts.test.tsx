/**
 * The review screen's conflicts panel against the real server (demo seed): two pushes of one reading
 * from the same base open a conflict; the panel shows both revisions side by side, and choosing the
 * device's revision resolves it through the sync feature's endpoint (checked back through the API).
 */
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { cleanup, fireEvent, render, screen, waitFor, within } from '@testing-library/react';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { SessionSchema } from '@shared/schemas/auth';
import { SurveyListSchema } from '@shared/schemas/home';
import { OfflineBundleSchema } from '@shared/schemas/offline';
import { ConflictListSchema, PushResponseSchema } from '@shared/schemas/sync';
import { ConflictsPanel } from '@/features/review/components/conflicts-panel';
import { api, apiRequest } from '@/lib/api';
import { DEMO_PASSWORD } from '../../server/db/seed/demo-data';
import { edited, makeReading, makeStation, mutationFor } from '../setup/sync-fixtures-core';
import { startTestApp, type TestApp } from '../setup/start-app';
import { pointWindowAt } from './helpers';

let app: TestApp;

const signIn = (email: string) => apiRequest('/api/auth/sign-in', { method: 'POST', body: { email, password: DEMO_PASSWORD }, schema: SessionSchema });

beforeAll(async () => {
  app = await startTestApp({ seed: 'demo' });
  pointWindowAt(app.baseUrl);
});
afterEach(cleanup);
afterAll(async () => {
  await app?.close();
});

describe('conflicts panel', () => {
  it('shows both revisions of a conflicting reading and resolves it with the chosen one', async () => {
    const surveyor = await signIn('surveyor@harrowby.example');
    const orgId = surveyor.memberships[0]!.organisationId;
    const surveys = await api.get(`/api/orgs/${orgId}/surveys`, SurveyListSchema);
    const survey = surveys.surveys.find((s) => s.state === 'open')!;
    const bundle = await api.get(`/api/orgs/${orgId}/surveys/${survey.id}/offline`, OfflineBundleSchema);
    const scope = { orgId, surveyId: survey.id, levelId: bundle.levels[0]!.id, userId: surveyor.user.id };
    const station = makeStation(scope);
    const reading = makeReading(scope, station.id, { magnitudeT: 1e-3 });
    const push = (mutations: ReturnType<typeof mutationFor>[], deviceId: string) => api.post(`/api/orgs/${orgId}/sync/push`, { deviceId, mutations }, PushResponseSchema);
    await push([mutationFor('stations', station), mutationFor('field_readings', reading)], 'tablet-a');
    await push([mutationFor('field_readings', edited(reading, { notes: 'tablet A: probe re-zeroed' }))], 'tablet-a');
    const { results } = await push([mutationFor('field_readings', edited(reading, { notes: 'tablet B: second look' }))], 'tablet-b');
    expect(results[0]!.status).toBe('conflict');

    await apiRequest('/api/auth/sign-out', { method: 'POST' });
    await signIn('reviewer@harrowby.example');
    const client = new QueryClient({ defaultOptions: { queries: { retry: false } } });
    render(
      <QueryClientProvider client={client}>
        <ConflictsPanel organisationId={orgId} surveyId={survey.id} readOnly={false} />
      </QueryClientProvider>,
    );
    const card = await screen.findByTestId('conflict', undefined, { timeout: 5000 });
    // Both revisions, with the field that differs.
    const notesRow = within(card).getByRole('rowheader', { name: 'notes' }).closest('tr')!;
    expect(notesRow.textContent).toContain('tablet A: probe re-zeroed');
    expect(notesRow.textContent).toContain('tablet B: second look');
    fireEvent.click(within(card).getByRole('button', { name: 'Choose the device’s revision' }));
    await waitFor(() => expect(screen.queryByTestId('conflict')).toBeNull(), { timeout: 5000 });
    await screen.findByText('No open conflicts.');

    const resolved = await api.get(`/api/orgs/${orgId}/sync/conflicts?surveyId=${survey.id}&state=resolved`, ConflictListSchema);
    const mine = resolved.conflicts.find((c) => c.recordId === reading.id)!;
    expect(mine).toMatchObject({ state: 'resolved', resolution: 'incoming' });
    expect(mine.resolvedByUserId).not.toBe(surveyor.user.id);
  });
});
