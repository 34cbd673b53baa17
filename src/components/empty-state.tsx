/**
 * What a list shows when it has nothing in it yet: what is missing, and what to do next. Every empty
 * list of the app uses this one shape, so a newcomer always finds the next step in the same place.
 * The words are the caller's: they depend on who is looking (a viewer is told who can add things).
 */
import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';

export interface EmptyStateAction {
  /** A route of the app; the link reads as the action (“Add a level”, not “click here”). */
  to: string;
  label: string;
}

export interface EmptyStateProps {
  /** What is missing, e.g. “No surveys yet”. */
  title: string;
  /** What to do next, in the role's words. */
  children?: ReactNode;
  /** A link to the screen where the next step is done. */
  action?: EmptyStateAction;
  /** Heading level of the title when the empty state stands in for a whole section; a plain paragraph otherwise. */
  headingLevel?: 2 | 3;
  className?: string;
  'data-testid'?: string;
}

export function EmptyState({ title, children, action, headingLevel, className = '', 'data-testid': testId = 'empty-state' }: EmptyStateProps) {
  const Title = headingLevel ? (`h${headingLevel}` as const) : 'p';
  return (
    <div className={`flex flex-col gap-1 rounded-xl border-2 border-dashed border-border bg-surface px-4 py-3 ${className}`} data-testid={testId}>
      <Title className="text-base font-bold text-fg">{title}</Title>
      {children && <div className="text-fg-muted">{children}</div>}
      {action && (
        <Link to={action.to} className="inline-flex min-h-touch items-center self-start font-bold text-link underline underline-offset-2">
          {action.label}
        </Link>
      )}
    </div>
  );
}
