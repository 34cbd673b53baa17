/**
 * The first-run guide on Home and the shared empty state: each role gets its own words and steps
 * into the real routes (src/app/router.tsx), putting the guide away is remembered on this device per
 * user, and it comes back with “Show the guide”. The surveys are demo-shaped summaries, parsed by
 * the wire schema the home screen uses.
 */
import { act, cleanup, fireEvent, render, screen, within } from '@testing-library/react';
import { MemoryRouter } from 'react-router-dom';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { ROLES, type Role } from '@shared/schemas/common';
import { SurveySummarySchema, type SurveySummary } from '@shared/schemas/home';
import { EmptyState } from '@/components/empty-state';
import { FirstRunGuide } from '@/features/first-run/components/first-run-guide';
import { SiteList } from '@/features/home/components/site-list';
import { SurveyList } from '@/features/home/components/survey-list';
import { guideStorageKey, setGuideDismissed } from '@/features/first-run/data/guide-dismissal';
import { guideFor, pickGuideSurvey } from '@/features/first-run/lib/guide-content';

const USER_A = '00000000-0000-7000-8000-0000000000a1';
const USER_B = '00000000-0000-7000-8000-0000000000b2';
const SITE = '00000000-0000-7000-8000-0000000000c3';

// Invented, demo-shaped surveys: one of each state; the surveyor is on the open one's team.
const survey = (id: string, state: SurveySummary['state'], assignedToMe: boolean, startsOn: string): SurveySummary =>
  SurveySummarySchema.parse({ id, siteId: SITE, siteName: 'Harrowby Bridge', name: `${state} survey`, state, startsOn, stationCount: 3, readingCount: 9, assignedToMe });
const SIGNED = survey('00000000-0000-7000-8000-000000000d01', 'signed_off', false, '2025-11-01');
const SUBMITTED = survey('00000000-0000-7000-8000-000000000d02', 'submitted', false, '2026-03-01');
const OPEN = survey('00000000-0000-7000-8000-000000000d03', 'open', true, '2026-11-01');
const SURVEYS = [SIGNED, SUBMITTED, OPEN];

function renderGuide(props: { userId?: string; role: Role; surveys?: SurveySummary[] }) {
  return render(
    <MemoryRouter>
      <FirstRunGuide userId={props.userId ?? USER_A} role={props.role} surveys={props.surveys ?? SURVEYS} />
    </MemoryRouter>,
  );
}

const stepLinks = () => within(screen.getByTestId('guide-steps')).queryAllByRole('link').map((a) => [a.textContent, a.getAttribute('href')]);

beforeEach(() => window.localStorage.clear());
afterEach(() => {
  cleanup();
  vi.restoreAllMocks();
});

describe('first-run guide content', () => {
  // Expected routes are the router's own paths (src/app/router.tsx) filled with the survey each role works on.
  const expected: Record<Role, { title: RegExp; links: Array<[string, string]> }> = {
    admin: {
      title: /run the organisation/,
      links: [
        ['Set up a site', '/sites'],
        ['Record each gaussmeter and analyser', '/instruments'],
        ['Plan a survey and its team', '/sites'],
        ['Follow it to sign-off', `/surveys/${OPEN.id}/review`],
      ],
    },
    reviewer: {
      title: /review and sign off/,
      links: [
        ['Review the readings', `/surveys/${SUBMITTED.id}/review`],
        ['Check the stations on the map', `/surveys/${SUBMITTED.id}/map`],
        ['Sign off and hand over the report', `/surveys/${SUBMITTED.id}/report`],
      ],
    },
    emc: {
      title: /emission \(EMC\)/,
      links: [
        ['Keep the list of watched bands', '/watch-bands'],
        ['Work through the flags', `/surveys/${OPEN.id}/emc`],
        ['Check analysers and antennas are in date', '/instruments'],
      ],
    },
    surveyor: {
      title: /walk the building/,
      links: [
        ['Open your survey and take it offline', `/surveys/${OPEN.id}`],
        ['Start capture', `/surveys/${OPEN.id}/capture`],
        ['Check your stations on the map', `/surveys/${OPEN.id}/map`],
      ],
    },
    viewer: {
      title: /read the results/,
      links: [
        ['Read the survey report', `/surveys/${SIGNED.id}/report`],
        ['See the EMC check', `/surveys/${SIGNED.id}/emc`],
      ],
    },
  };

  it.each(ROLES)('the %s sees what the role does and two to four steps into the real screens', (role) => {
    renderGuide({ role });
    const guide = screen.getByRole('region', { name: expected[role].title });
    expect(guide.getAttribute('data-role')).toBe(role);
    expect(stepLinks()).toEqual(expected[role].links);
    expect(expected[role].links.length).toBeGreaterThanOrEqual(2);
    expect(expected[role].links.length).toBeLessThanOrEqual(4);
    // Every role is told the tool does not replace the MR safety officer (DESIGN.md §6).
    expect(guide.textContent).toMatch(/MR safety officer/);
  });

  it('only the surveyor, who goes near the magnets, gets the implant and projectile cautions', () => {
    for (const role of ROLES) {
      renderGuide({ role });
      const cautions = screen.queryByTestId('guide-cautions');
      if (role === 'surveyor') {
        expect(cautions?.textContent).toMatch(/pacemakers/);
        expect(cautions?.textContent).toMatch(/projectiles/);
        expect(cautions?.textContent).toMatch(/non-magnetic tools/);
      } else {
        expect(cautions).toBeNull();
      }
      cleanup();
    }
  });

  it('a viewer is told who can change things', () => {
    expect(guideFor('viewer', SIGNED).intro).toMatch(/ask a reviewer or an admin/);
  });

  it('each role is led to the survey it works on: own assignment, submitted, signed off', () => {
    expect(pickGuideSurvey('surveyor', SURVEYS)?.id).toBe(OPEN.id);
    // A surveyor's own assignment wins over an open survey they are not on.
    const otherOpen = survey('00000000-0000-7000-8000-000000000d04', 'open', false, '2026-12-01');
    const mineSubmitted = { ...SUBMITTED, assignedToMe: true };
    expect(pickGuideSurvey('surveyor', [otherOpen, mineSubmitted])?.id).toBe(SUBMITTED.id);
    expect(pickGuideSurvey('reviewer', SURVEYS)?.id).toBe(SUBMITTED.id);
    expect(pickGuideSurvey('viewer', SURVEYS)?.id).toBe(SIGNED.id);
    expect(pickGuideSurvey('emc', SURVEYS)?.id).toBe(OPEN.id);
    // Among surveys in the same state, the newest start first.
    expect(pickGuideSurvey('emc', [OPEN, otherOpen])?.id).toBe(otherOpen.id);
    expect(pickGuideSurvey('admin', [])).toBeUndefined();
  });

  it('with no survey yet, the survey steps say who plans one instead of linking nowhere', () => {
    renderGuide({ role: 'surveyor', surveys: [] });
    expect(stepLinks()).toEqual([]);
    expect(screen.getByTestId('guide-steps').textContent).toMatch(/an admin or reviewer plans one/);
    cleanup();
    renderGuide({ role: 'admin', surveys: [] });
    expect(stepLinks().map(([, href]) => href)).toEqual(['/sites', '/instruments', '/sites']);
  });

  it('while the survey list is still loading, the steps do not claim there is no survey', () => {
    render(
      <MemoryRouter>
        <FirstRunGuide userId={USER_A} role="reviewer" surveys={undefined} />
      </MemoryRouter>,
    );
    expect(stepLinks()).toEqual([]);
    expect(screen.getByTestId('guide-steps').textContent).not.toMatch(/no survey yet/);
    expect(screen.getByTestId('guide-steps').textContent).toMatch(/Review the readings/);
  });
});

describe('putting the guide away', () => {
  it('is remembered for the user on this device, and “Show the guide” brings it back with focus on it', () => {
    const first = renderGuide({ role: 'reviewer' });
    fireEvent.click(screen.getByRole('button', { name: 'Hide the guide' }));
    expect(screen.queryByTestId('first-run-guide')).toBeNull();
    const show = screen.getByRole('button', { name: 'Show the guide' });
    expect(document.activeElement).toBe(show);
    expect(window.localStorage.getItem(guideStorageKey(USER_A, 'reviewer'))).toBe('dismissed');

    // A new visit (fresh render) finds it still put away.
    first.unmount();
    renderGuide({ role: 'reviewer' });
    expect(screen.queryByTestId('first-run-guide')).toBeNull();
    cleanup();

    // Another user on the same device, and the same user in another role, still get their guide.
    renderGuide({ userId: USER_B, role: 'reviewer' });
    expect(screen.getByTestId('first-run-guide')).toBeTruthy();
    cleanup();
    renderGuide({ role: 'surveyor' });
    expect(screen.getByTestId('first-run-guide')).toBeTruthy();
    cleanup();

    renderGuide({ role: 'reviewer' });
    fireEvent.click(screen.getByRole('button', { name: 'Show the guide' }));
    const heading = screen.getByRole('heading', { level: 2, name: /review and sign off/ });
    expect(document.activeElement).toBe(heading);
    expect(window.localStorage.getItem(guideStorageKey(USER_A, 'reviewer'))).toBeNull();
  });

  it('a change made elsewhere (another tab of the app) shows at once', () => {
    renderGuide({ role: 'emc' });
    act(() => setGuideDismissed(USER_A, 'emc', true));
    expect(screen.queryByTestId('first-run-guide')).toBeNull();
    expect(screen.getByRole('button', { name: 'Show the guide' })).toBeTruthy();
  });

  it('when the browser refuses to store the choice, the guide still goes away for this visit', () => {
    // A storage failure (private mode, full quota) is a rare state the real browser cannot be made to produce here.
    vi.spyOn(window.localStorage, 'setItem').mockImplementation(() => {
      throw new DOMException('The quota has been exceeded.', 'QuotaExceededError');
    });
    renderGuide({ userId: USER_B, role: 'viewer' });
    fireEvent.click(screen.getByRole('button', { name: 'Hide the guide' }));
    expect(screen.queryByTestId('first-run-guide')).toBeNull();
    expect(window.localStorage.getItem(guideStorageKey(USER_B, 'viewer'))).toBeNull();
  });
});

describe('empty state', () => {
  it('says what is missing, what to do next, and links to where it is done', () => {
    render(
      <MemoryRouter>
        <EmptyState title="No levels yet" action={{ to: '/sites', label: 'Add the first site' }}>
          Add the first one below.
        </EmptyState>
      </MemoryRouter>,
    );
    const box = screen.getByTestId('empty-state');
    expect(within(box).getByText('No levels yet')).toBeTruthy();
    expect(within(box).getByText('Add the first one below.')).toBeTruthy();
    expect(within(box).getByRole('link', { name: 'Add the first site' }).getAttribute('href')).toBe('/sites');
    expect(within(box).queryByRole('heading')).toBeNull();
  });

  it('without an action it has no link; with a heading level its title is a heading', () => {
    render(
      <MemoryRouter>
        <EmptyState title="No surveys in this organisation yet" headingLevel={3}>
          An admin or reviewer plans the surveys.
        </EmptyState>
      </MemoryRouter>,
    );
    const box = screen.getByTestId('empty-state');
    expect(within(box).queryByRole('link')).toBeNull();
    expect(within(box).getByRole('heading', { level: 3, name: 'No surveys in this organisation yet' })).toBeTruthy();
  });
});

describe('empty lists on Home', () => {
  it('tell admins and reviewers where to start, and everyone else who adds things', () => {
    for (const role of ROLES) {
      render(
        <MemoryRouter>
          <SurveyList surveys={[]} role={role} />
          <SiteList sites={[]} role={role} />
        </MemoryRouter>,
      );
      const boxes = screen.getAllByTestId('empty-state');
      expect(boxes.map((b) => b.querySelector('p')?.textContent)).toEqual(['No surveys in this organisation yet', 'No sites in this organisation yet']);
      const links = screen.queryAllByRole('link').map((a) => a.getAttribute('href'));
      if (role === 'admin' || role === 'reviewer') {
        expect(links).toEqual(['/sites', '/sites']);
      } else {
        // The site setup screen is not theirs: no link, but who does it.
        expect(links).toEqual([]);
        expect(boxes.every((b) => /admin or reviewer/.test(b.textContent ?? ''))).toBe(true);
      }
      cleanup();
    }
  });
});
