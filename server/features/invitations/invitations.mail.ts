import type { Role } from '../../../shared/schemas/common';
import { escapeHtml, type OutgoingMail } from '../../lib/mail';

const ROLE_WORDS: Record<Role, string> = {
  admin: 'an admin',
  reviewer: 'a reviewer',
  emc: 'an EMC engineer',
  surveyor: 'a surveyor',
  viewer: 'a viewer',
};

export function invitationMail(options: { to: string; organisationName: string; inviterName: string; role: Role; link: string; validDays: number }): OutgoingMail {
  const { to, organisationName, inviterName, role, link, validDays } = options;
  const line = `${inviterName} has invited you to join ${organisationName} on Fringewalk as ${ROLE_WORDS[role]}.`;
  return {
    to,
    subject: `You are invited to ${organisationName} on Fringewalk`,
    text: [line, '', `Open this link within ${validDays} days to accept:`, '', link, '', 'If you did not expect this, ignore this e-mail.'].join('\n'),
    html: `<p>${escapeHtml(line)}</p><p>Open this link within ${validDays} days to accept:</p><p><a href="${escapeHtml(link)}">${escapeHtml(link)}</a></p><p>If you did not expect this, ignore this e-mail.</p>`,
  };
}
