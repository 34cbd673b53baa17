/**
 * The first screen each role sees on Home: what this role does in Fringewalk (DESIGN.md §1, in the
 * words of DESIGN.md §3) and two to four steps into the real screens. A step that needs a survey
 * points at the survey that suits the role best; with no survey yet it says who creates one.
 */
import type { Role } from '@shared/schemas/common';
import type { SurveySummary } from '@shared/schemas/home';

export interface GuideStep {
  /** Reads as the action; it is also the link's name. */
  label: string;
  /** Route of the screen where the step is done; absent while the screen needs a survey that does not exist yet. */
  to?: string;
  detail: string;
}

export interface RoleGuide {
  role: Role;
  title: string;
  intro: string;
  steps: GuideStep[];
  /** Safety notes for this role (DESIGN.md §6), shown above the general caution every role sees. */
  cautions: string[];
}

/** The general caution every role sees: the tool supports, and does not replace, licensed practice (DESIGN.md §6). */
export const GENERAL_CAUTION =
  'Safety lines and line positions support, and do not replace, the site’s MR safety officer, radiation-protection adviser and licensed practice. Thresholds differ by jurisdiction and by implant: follow local rules.';

export const SURVEYOR_CAUTIONS = [
  'Near strong magnets carry non-magnetic tools only: ferromagnetic objects become projectiles.',
  'People with implants such as pacemakers stay outside the implant line; check with the site’s MR safety officer before entering any controlled area.',
];

const STATE_PREFERENCE: Record<Role, ReadonlyArray<SurveySummary['state']>> = {
  admin: ['open', 'submitted', 'signed_off'],
  reviewer: ['submitted', 'open', 'signed_off'],
  emc: ['open', 'submitted', 'signed_off'],
  surveyor: ['open', 'submitted', 'signed_off'],
  viewer: ['signed_off', 'submitted', 'open'],
};

/**
 * The survey the role's steps lead into: a surveyor's own assignment first, then by the state the
 * role works on (a reviewer the submitted one, a viewer the signed-off one), newest start first.
 */
export function pickGuideSurvey(role: Role, surveys: readonly SurveySummary[]): SurveySummary | undefined {
  const rank = (s: SurveySummary) => {
    const stateRank = STATE_PREFERENCE[role].indexOf(s.state);
    const mineRank = role === 'surveyor' && s.assignedToMe ? 0 : 1;
    return mineRank * 10 + stateRank;
  };
  return [...surveys].sort((a, b) => rank(a) - rank(b) || (b.startsOn ?? '').localeCompare(a.startsOn ?? ''))[0];
}

const NO_SURVEY = 'There is no survey yet: an admin or reviewer plans one from a site’s page.';

/**
 * `surveysLoaded` false (the list is still on its way, or was never saved on this device): the survey
 * steps show without a link and without claiming that no survey exists.
 */
export function guideFor(role: Role, survey: SurveySummary | undefined, surveysLoaded = true): RoleGuide {
  const at = (suffix: string) => (survey ? `/surveys/${survey.id}${suffix}` : undefined);
  const onSurvey = (detail: string) => (survey || !surveysLoaded ? detail : `${detail} ${NO_SURVEY}`);

  switch (role) {
    case 'admin':
      return {
        role,
        title: 'You run the organisation',
        intro: 'Admins keep the sites, their levels, plans, rooms and magnet sources, the instruments and their calibration dates, and the people who survey.',
        steps: [
          { label: 'Set up a site', to: '/sites', detail: 'Add a site, its levels with a plan calibrated to metres, the rooms and the magnet sources on each plan.' },
          { label: 'Record each gaussmeter and analyser', to: '/instruments', detail: 'Serial, calibration due date and uncertainty: every field reading names the instrument that made it.' },
          { label: 'Plan a survey and its team', to: '/sites', detail: 'On a site’s page, start a survey, choose its levels and zone set, and assign the surveyors.' },
          { label: 'Follow it to sign-off', to: at('/review'), detail: onSurvey('Reviewers merge the walks, decide each reading and sign the survey off.') },
        ],
        cautions: [],
      };
    case 'reviewer':
      return {
        role,
        title: 'You review and sign off surveys',
        intro: 'Reviewers merge the walks of several surveyors into one survey, accept or reject each field reading, ask for a re-measure, and sign the survey off.',
        steps: [
          { label: 'Review the readings', to: at('/review'), detail: onSurvey('Decide each reading: accepted, re-measure or rejected, with a note.') },
          { label: 'Check the stations on the map', to: at('/map'), detail: onSurvey('Safety lines, repeat readings that disagree, and the comparison with the last signed-off survey.') },
          { label: 'Sign off and hand over the report', to: at('/report'), detail: onSurvey('Once every reading is decided, sign the survey off; the report is what goes to the regulator or client.') },
        ],
        cautions: [],
      };
    case 'emc':
      return {
        role,
        title: 'You look after emission (EMC)',
        intro: 'Emitters in a stray field radiate cyclotron lines. EMC engineers keep the bands the organisation protects and work the flags where a predicted line falls inside one.',
        steps: [
          { label: 'Keep the list of watched bands', to: '/watch-bands', detail: 'Start from the starter set, import a CSV, or add a band with its reason and source.' },
          { label: 'Work through the flags', to: at('/emc'), detail: onSurvey('Each flag is a line inside a watch band, in a room with its emitters; acknowledge or resolve it with a note.') },
          { label: 'Check analysers and antennas are in date', to: '/instruments', detail: 'Sweeps are only as good as the analyser’s calibration and the antenna factors.' },
        ],
        cautions: [],
      };
    case 'surveyor':
      return {
        role,
        title: 'You walk the building and measure',
        intro: 'Surveyors take a survey onto their device, mark stations on the plan and log field readings and sweeps, with or without a network. Everything syncs when a network appears.',
        steps: [
          { label: 'Open your survey and take it offline', to: at(''), detail: onSurvey('Do this with a network, before you go into the basement or the vault.') },
          { label: 'Start capture', to: at('/capture'), detail: onSurvey('Mark a station on the plan, then log a field reading (and a sweep if you carry an analyser).') },
          { label: 'Check your stations on the map', to: at('/map'), detail: onSurvey('See what has synced, and the re-measure requests from the reviewer.') },
        ],
        cautions: SURVEYOR_CAUTIONS,
      };
    case 'viewer':
      return {
        role,
        title: 'You read the results',
        intro: 'Viewers read the signed-off surveys: where the safety lines fall, room by room, and what the EMC check found. To change anything, ask a reviewer or an admin.',
        steps: [
          { label: 'Read the survey report', to: at('/report'), detail: onSurvey('The signed report: stations, safety lines, instruments and their calibration.') },
          { label: 'See the EMC check', to: at('/emc'), detail: onSurvey('Rooms where a predicted cyclotron line falls in a band the organisation protects.') },
        ],
        cautions: [],
      };
  }
}
