/**
 * What the invitation and password-reset e-mails say (docs/accounts.md). Pure, so their words
 * are tested directly. They hold the link and when it stops working; nothing about any patient.
 */
import { formatInstant, type Clinic } from '../present/format';
import { roleLabel } from '../present/labels';

/** The invitation e-mail: who invites, as what, the link, and until when it works. */
export function composeInvitation(opts: {
  inviterName: string;
  role: string;
  link: string;
  expiresAt: string;
  clinic: Clinic;
}): { subject: string; text: string } {
  const until = formatInstant(opts.expiresAt, opts.clinic, 'dateTime');
  return {
    subject: 'Your invitation to Coneline',
    text: [
      `${opts.inviterName} invited you to Coneline, the obturation log of your teaching clinic, as ${article(roleLabel(opts.role))}.`,
      `Choose your name and a password here:\n${opts.link}`,
      `The link works once, until ${until} (7 days). After that, ask your course director for a new one.`,
      'If you did not expect this e-mail, ignore it: no account is made unless the link is used.',
      '— Coneline',
    ].join('\n\n'),
  };
}

/** The password-reset e-mail, asked for by the account holder or sent by a director. */
export function composeReset(opts: { link: string; expiresAt: string; clinic: Clinic; byDirector: boolean }): {
  subject: string;
  text: string;
} {
  const until = formatInstant(opts.expiresAt, opts.clinic, 'time');
  const first = opts.byDirector
    ? 'Your course director sent you this link to set a new Coneline password.'
    : 'Someone, we hope you, asked for a new password for your Coneline account.';
  return {
    subject: 'Set a new Coneline password',
    text: [
      first,
      `Set a new password here:\n${opts.link}`,
      `The link works once, until ${until} (1 hour). Setting a password signs you out on every device; then sign in with the new one.`,
      'If you did not ask for this, ignore this e-mail: your password stays as it is.',
      '— Coneline',
    ].join('\n\n'),
  };
}

function article(label: string): string {
  return `${/^[aeiou]/i.test(label) ? 'an' : 'a'} ${label.toLowerCase()}`;
}
