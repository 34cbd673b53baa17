import type { Membership } from '@shared/schemas/auth';
import { ROLE_LABELS } from '@/lib/roles';

/** The active organisation: a plain name, or a select when the user belongs to several. */
export function OrganisationSwitcher({
  memberships,
  activeId,
  onChoose,
}: {
  memberships: Membership[];
  activeId: string | undefined;
  onChoose: (organisationId: string) => void;
}) {
  if (memberships.length <= 1) {
    return <p className="mt-0.5 text-sm leading-tight text-header-muted">{memberships[0]?.organisationName ?? 'No organisation'}</p>;
  }
  return (
    <label className="flex flex-col text-sm">
      <span className="text-header-muted">Organisation</span>
      <select
        value={activeId}
        onChange={(event) => onChoose(event.target.value)}
        className="min-h-touch max-w-64 rounded-lg border-2 border-header-muted bg-header px-2 font-bold text-header-fg"
      >
        {memberships.map((m) => (
          <option key={m.organisationId} value={m.organisationId}>
            {m.organisationName} ({ROLE_LABELS[m.role]})
          </option>
        ))}
      </select>
    </label>
  );
}
