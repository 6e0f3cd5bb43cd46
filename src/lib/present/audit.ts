// The audit log in words: what each recorded action means, and its detail as a line of text.

const ACTIONS: Readonly<Record<string, string>> = {
  'settings.change': 'Changed the course settings',
  'settings.recompute': 'Asked for every unlocked canal to be judged again',
  'case.signoff': 'Signed off a case',
  'case.reopen': 'Reopened a signed-off case',
  'case.comment': 'Commented on a case',
  'case.discard': 'Discarded a case',
  'case.restore': 'Restored a discarded case',
  'user.created': 'Created an account',
  'user.deactivated': 'Deactivated an account',
  'user.reactivated': 'Re-activated an account',
  'user.password-changed': 'Changed their own password',
  'user.password-set': 'Set an account’s password',
  'user.signed-out': 'Signed out',
  'user.signed-out-everywhere': 'Signed out on every device',
  'user.mail-preference': 'Changed their review e-mail preference',
  'user.password-reset-requested': 'Asked for a password reset link',
  'user.password-reset-sent': 'Sent an account a password reset link',
  'user.password-reset': 'Set a new password from a reset link',
  'user.role-changed': 'Changed an account’s role',
  'user.holds-lifted': 'Lifted an account’s sign-in holds',
  'user.cohort-changed': 'Moved a student to another cohort',
  'assignments.changed': 'Changed a student’s attendings',
  'cohort.created': 'Created a cohort',
  'cohort.renamed': 'Renamed a cohort',
  'cohort.class-year-set': 'Set a cohort’s class year',
  'cohort.archived': 'Archived a cohort',
  'cohort.restored': 'Brought back an archived cohort',
  'invitation.created': 'Invited someone to Coneline',
  'invitation.resent': 'Sent an invitation again',
  'invitation.revoked': 'Revoked an invitation',
  'invitation.accepted': 'Accepted an invitation',
  'demo.removed': 'Removed the demo data',
};

/** Every action the words above cover (the audit page lists them in its filter). */
export const KNOWN_AUDIT_ACTIONS: readonly string[] = Object.keys(ACTIONS);

/** An action in words: "settings.change" → "Changed the course settings"; an unknown one is spelled out. */
export function auditActionWords(action: string): string {
  const known = ACTIONS[action];
  if (known) return known;
  const words = action.replace(/[._-]+/g, ' ').trim();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

const SUBJECTS: Readonly<Record<string, string>> = {
  case: 'Case',
  user: 'Account',
  settings: 'Settings version',
  invitation: 'Invitation',
};

/** A subject type in words ("user" → "Account"). */
export function auditSubjectWords(subjectType: string | null): string {
  if (subjectType === null) return '—';
  return SUBJECTS[subjectType] ?? subjectType.charAt(0).toUpperCase() + subjectType.slice(1);
}

const plain = (v: unknown): string =>
  v === null || v === undefined ? '—' : typeof v === 'object' ? JSON.stringify(v) : String(v);

/**
 * The detail of an audit line as one line of text: a settings change as "name: old → new", any
 * other detail as "key: value" pairs. Only what the line stores is shown.
 */
export function auditDetailText(action: string, detail: Record<string, unknown> | null): string {
  if (!detail || Object.keys(detail).length === 0) return '';
  const changes = detail.changes;
  if (action === 'settings.change' && changes && typeof changes === 'object') {
    return Object.entries(changes as Record<string, unknown>)
      .map(([name, c]) =>
        c && typeof c === 'object' && 'from' in c && 'to' in c
          ? `${name}: ${plain((c as { from: unknown }).from)} → ${plain((c as { to: unknown }).to)}`
          : `${name}: ${plain(c)}`,
      )
      .join('; ');
  }
  return Object.entries(detail)
    .map(([k, v]) => `${k}: ${plain(v)}`)
    .join('; ');
}
