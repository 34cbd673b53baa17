import { useState } from 'react';
import type { Member } from '@shared/schemas/member';
import { ASSIGNABLE_REVIEWER_ROLES, ASSIGNABLE_SURVEYOR_ROLES, type SurveySettings } from '@shared/schemas/survey-setup';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { ROLE_LABELS } from '@/lib/roles';
import { useMembers } from '../data/list-members';
import { useSetSurveyTeam } from '../data/set-survey-team';
import { QueryState } from './query-state';

function Picker({ legend, members, chosen, onToggle }: { legend: string; members: Member[]; chosen: Set<string>; onToggle: (userId: string) => void }) {
  return (
    <fieldset className="flex flex-col gap-2">
      <legend className="text-lg font-bold">{legend}</legend>
      {members.length === 0 ? (
        <p className="text-fg-muted">Nobody in the organisation has a role that allows this yet.</p>
      ) : (
        members.map((member) => (
          <label key={member.userId} className="flex min-h-touch items-center gap-3 rounded-lg border-2 border-field-border px-3">
            <input type="checkbox" className="h-6 w-6 accent-accent" checked={chosen.has(member.userId)} onChange={() => onToggle(member.userId)} />
            <span>
              <span className="font-bold">{member.name || member.email}</span> <span className="text-sm text-fg-muted">{member.email} · {ROLE_LABELS[member.role]}</span>
            </span>
          </label>
        ))
      )}
    </fieldset>
  );
}

/** Who walks and who reviews a survey; newly added surveyors are e-mailed a link by the server. */
export function SurveyTeam({ organisationId, survey }: { organisationId: string; survey: SurveySettings }) {
  const members = useMembers(organisationId);
  const setTeam = useSetSurveyTeam(organisationId, survey.id);
  const [surveyors, setSurveyors] = useState(() => new Set(survey.team.surveyors.map((m) => m.userId)));
  const [reviewers, setReviewers] = useState(() => new Set(survey.team.reviewers.map((m) => m.userId)));
  const [mailed, setMailed] = useState<string[] | null>(null);
  const toggle = (set: Set<string>, update: (next: Set<string>) => void) => (userId: string) => {
    const next = new Set(set);
    if (next.has(userId)) next.delete(userId);
    else next.add(userId);
    update(next);
  };
  if (!members.data) return <QueryState label="members" query={members} />;
  const all = members.data.members;
  const byId = new Map(all.map((m) => [m.userId, m]));
  return (
    <div className="flex flex-col gap-4">
      <div className="grid grid-cols-1 gap-4 md:grid-cols-2">
        <Picker legend="Surveyors" members={all.filter((m) => ASSIGNABLE_SURVEYOR_ROLES.includes(m.role))} chosen={surveyors} onToggle={toggle(surveyors, setSurveyors)} />
        <Picker legend="Reviewers" members={all.filter((m) => ASSIGNABLE_REVIEWER_ROLES.includes(m.role))} chosen={reviewers} onToggle={toggle(reviewers, setReviewers)} />
      </div>
      <div>
        <Button
          busy={setTeam.isPending}
          busyLabel="Saving…"
          onClick={() => setTeam.mutate({ surveyors: [...surveyors], reviewers: [...reviewers] }, { onSuccess: (result) => setMailed(result.mailed) })}
        >
          Save team
        </Button>
      </div>
      {mailed && (
        <Alert tone="ok" title="Team saved">
          <span data-testid="mailed">
            {mailed.length === 0
              ? 'Nobody new to e-mail.'
              : `E-mailed a link to ${mailed.map((id) => byId.get(id)?.name || byId.get(id)?.email || 'a member').join(', ')}.`}
          </span>
        </Alert>
      )}
    </div>
  );
}
