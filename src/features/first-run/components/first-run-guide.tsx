/**
 * The first-run guide on Home: a panel in the page (never an overlay, so it blocks nothing) telling
 * the signed-in role what it does here and where to start. Hidden with one button, remembered on
 * this device for the user, and brought back with “Show the guide”.
 */
import { useEffect, useRef } from 'react';
import { Link } from 'react-router-dom';
import type { Role } from '@shared/schemas/common';
import type { SurveySummary } from '@shared/schemas/home';
import { Button } from '@/components/button';
import { useGuideDismissed } from '../data/guide-dismissal';
import { GENERAL_CAUTION, guideFor, pickGuideSurvey } from '../lib/guide-content';

export interface FirstRunGuideProps {
  userId: string;
  role: Role;
  /** The organisation's surveys, when loaded: the steps lead into the one that suits the role. */
  surveys: readonly SurveySummary[] | undefined;
}

export function FirstRunGuide({ userId, role, surveys }: FirstRunGuideProps) {
  const [dismissed, setDismissed] = useGuideDismissed(userId, role);
  const headingRef = useRef<HTMLHeadingElement>(null);
  const showRef = useRef<HTMLButtonElement>(null);
  // Focus follows the toggle (not the first render), so a keyboard user is never left on a vanished button.
  const toggled = useRef(false);

  useEffect(() => {
    if (!toggled.current) return;
    toggled.current = false;
    (dismissed ? showRef.current : headingRef.current)?.focus();
  }, [dismissed]);

  function toggle(next: boolean) {
    toggled.current = true;
    setDismissed(next);
  }

  if (dismissed) {
    return (
      <div className="flex">
        <Button ref={showRef} variant="secondary" onClick={() => toggle(false)} data-testid="show-guide">
          Show the guide
        </Button>
      </div>
    );
  }

  const survey = surveys ? pickGuideSurvey(role, surveys) : undefined;
  const guide = guideFor(role, survey, surveys !== undefined);

  return (
    <section
      aria-labelledby="first-run-title"
      className="flex flex-col gap-4 rounded-xl border-2 border-l-8 border-accent bg-surface p-4 sm:p-6"
      data-testid="first-run-guide"
      data-role={role}
    >
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div className="flex flex-col gap-1">
          <p className="text-sm font-bold uppercase tracking-wide text-accent-soft-fg">Start here</p>
          <h2 id="first-run-title" ref={headingRef} tabIndex={-1} className="text-2xl font-bold">
            {guide.title}
          </h2>
        </div>
        <Button variant="secondary" onClick={() => toggle(true)} data-testid="hide-guide">
          Hide the guide
        </Button>
      </div>
      <p>{guide.intro}</p>
      <ol className="flex flex-col gap-3" aria-label="Where to start" data-testid="guide-steps">
        {guide.steps.map((step, index) => (
          <li key={step.label} className="flex gap-3">
            <span aria-hidden="true" className="mt-2 flex h-8 w-8 shrink-0 items-center justify-center rounded-full bg-accent font-bold text-accent-fg">
              {index + 1}
            </span>
            <div className="flex flex-col">
              {step.to ? (
                <Link to={step.to} className="inline-flex min-h-touch items-center self-start font-bold text-link underline underline-offset-2" data-testid="guide-step-link">
                  {step.label}
                </Link>
              ) : (
                <p className="flex min-h-touch items-center font-bold">{step.label}</p>
              )}
              <p>{step.detail}</p>
            </div>
          </li>
        ))}
      </ol>
      {guide.cautions.length > 0 && (
        <div className="rounded-lg border-l-8 border-warning bg-warning-soft px-4 py-3" data-testid="guide-cautions">
          <p className="font-bold text-warning">Before you go near a magnet</p>
          <ul className="list-disc pl-5 text-fg">
            {guide.cautions.map((caution) => (
              <li key={caution}>{caution}</li>
            ))}
          </ul>
        </div>
      )}
      <p className="text-sm text-fg-muted">{GENERAL_CAUTION}</p>
    </section>
  );
}
