import type { ReactNode } from 'react';
import type { DevMailList } from '@shared/schemas/dev-mail';
import { EmptyState } from '@/components/empty-state';

const URL_PATTERN = /(https?:\/\/[^\s<>"]+)/g;

/** Plain text with its links clickable, so a developer can follow a reset or invitation link. */
function Linkified({ text }: { text: string }) {
  const parts: ReactNode[] = text.split(URL_PATTERN).map((part, index) =>
    index % 2 === 1 ? (
      <a key={index} href={part} className="break-all">
        {part}
      </a>
    ) : (
      part
    ),
  );
  return <>{parts}</>;
}

export function MailList({ messages }: { messages: DevMailList['messages'] }) {
  if (messages.length === 0) {
    return <EmptyState title="No e-mail captured yet">Invitations and password resets appear here: ask for a password reset from the sign-in screen to see one.</EmptyState>;
  }
  const newestFirst = [...messages].sort((a, b) => b.receivedAt.localeCompare(a.receivedAt));
  return (
    <ul className="flex flex-col gap-3" aria-label="Captured e-mail">
      {newestFirst.map((mail) => (
        <li key={mail.id} className="rounded-xl border border-border bg-surface">
          <details>
            <summary className="flex min-h-touch cursor-pointer flex-wrap items-center gap-x-4 gap-y-1 px-4 py-2">
              <span className="font-bold">{mail.subject || '(no subject)'}</span>
              <span className="text-sm text-fg-muted">to {mail.to.join(', ')}</span>
              <span className="ml-auto text-sm text-fg-muted">{new Date(mail.receivedAt).toLocaleString()}</span>
            </summary>
            <pre className="overflow-x-auto whitespace-pre-wrap border-t border-border px-4 py-3 font-sans text-base">
              <Linkified text={mail.text} />
            </pre>
          </details>
        </li>
      ))}
    </ul>
  );
}
