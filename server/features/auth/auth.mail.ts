import { escapeHtml, type OutgoingMail } from '../../lib/mail';

export function passwordResetMail(options: { to: string; name: string; link: string; validMinutes: number }): OutgoingMail {
  const { to, name, link, validMinutes } = options;
  return {
    to,
    subject: 'Reset your Fringewalk password',
    text: [
      `Hello ${name},`,
      '',
      'Someone (we hope you) asked to reset the password of your Fringewalk account.',
      `Open this link within ${validMinutes} minutes to choose a new password:`,
      '',
      link,
      '',
      'If you did not ask for this, ignore this e-mail: your password stays as it is.',
    ].join('\n'),
    html: `<p>Hello ${escapeHtml(name)},</p><p>Someone (we hope you) asked to reset the password of your Fringewalk account. Open this link within ${validMinutes} minutes to choose a new password:</p><p><a href="${escapeHtml(link)}">${escapeHtml(link)}</a></p><p>If you did not ask for this, ignore this e-mail: your password stays as it is.</p>`,
  };
}
