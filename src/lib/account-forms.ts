/**
 * The bodies of the invitation and password-reset routes and their answers (docs/accounts.md),
 * declared once with zod for the forms (react-hook-form's resolver) and the routes alike. The
 * server adds what only it can check: the common-password list (password-policy.ts, too large
 * for a page), whether an account or a cohort exists.
 *
 * Imports zod and types only: the islands that use it must share no module with the
 * chairside's first paint (docs/architecture.md, "Chairside budget").
 */
import { z } from 'zod';
import { ROLES, type Role } from './contract';

/** The roles, as in contract.ts (checked below), repeated so this file imports no module of the tablet's. */
export const ACCOUNT_ROLES = ROLES;
// Fails to compile if contract.ts ever has a role this list lacks.
const _everyRole: readonly (typeof ACCOUNT_ROLES)[number][] = [] as Role[];
void _everyRole;

export const MIN_PASSWORD_CHARS = 12;
export const MAX_PASSWORD_CHARS = 200;
export const MAX_NAME_CHARS = 120;
export const MAX_EMAIL_CHARS = 254;
/** The most rows one CSV invitation takes. */
export const MAX_CSV_ROWS = 300;
/** The most characters of CSV text one request takes. */
export const MAX_CSV_CHARS = 60_000;

const chars = (s: string) => [...s].length;

export const requestId = z
  .string({ required_error: 'id is required' })
  .uuid('id must be a request id (a UUID) made by the page');

export const emailField = z
  .string({ required_error: 'Enter an e-mail address.' })
  .trim()
  .toLowerCase()
  .min(1, 'Enter an e-mail address.')
  .max(MAX_EMAIL_CHARS, `An e-mail address has at most ${MAX_EMAIL_CHARS} characters.`)
  .email('Enter an e-mail address such as name@school.example.');

export const nameField = z
  .string({ required_error: 'Enter your name.' })
  .trim()
  .min(1, 'Enter your name.')
  .max(MAX_NAME_CHARS, `A name has at most ${MAX_NAME_CHARS} characters.`);

/** Length only; the server also refuses passwords on the common-password list. */
export const passwordField = z
  .string({ required_error: 'Choose a password.' })
  .refine((p) => chars(p) >= MIN_PASSWORD_CHARS, `Use at least ${MIN_PASSWORD_CHARS} characters.`)
  .refine((p) => chars(p) <= MAX_PASSWORD_CHARS, `Use at most ${MAX_PASSWORD_CHARS} characters.`)
  .refine((p) => p.trim() !== '', 'A password cannot be only spaces.');

const roleField = z.enum(ACCOUNT_ROLES, {
  errorMap: () => ({ message: 'Choose a role: student, attending or director.' }),
});
const cohortField = z
  .number({ invalid_type_error: 'cohortId must be a cohort’s number' })
  .int()
  .positive()
  .nullable()
  .optional();
const attendingsField = z
  .array(z.number().int().positive(), { invalid_type_error: 'attendingIds must be a list of account numbers' })
  .max(20, 'Choose at most 20 attendings.')
  .optional();

/** Only a student is assigned attendings. */
function attendingsForStudents(v: { role: Role; attendingIds?: number[] | undefined }, ctx: z.RefinementCtx): void {
  if (v.role !== 'student' && (v.attendingIds?.length ?? 0) > 0) {
    ctx.addIssue({
      code: z.ZodIssueCode.custom,
      path: ['attendingIds'],
      message: 'Only a student is assigned attendings.',
    });
  }
}

/** The fields a director fills in to invite one address (the form: no request id). */
const inviteFields = z.object({
  email: emailField,
  name: z
    .string()
    .trim()
    .max(MAX_NAME_CHARS, `A name has at most ${MAX_NAME_CHARS} characters.`)
    .optional()
    .transform((n) => (n ? n : undefined)),
  role: roleField,
  cohortId: cohortField,
  attendingIds: attendingsField,
});

/** The invitation form, without the request id the page adds when sending. */
export const inviteFormSchema = inviteFields.superRefine(attendingsForStudents);
export type InviteForm = z.input<typeof inviteFormSchema>;

/** POST /api/invitations. */
export const inviteSchema = inviteFields.extend({ id: requestId }).strict().superRefine(attendingsForStudents);
export type InviteRequest = z.input<typeof inviteSchema>;
export type Invite = z.output<typeof inviteSchema>;

const inviteCsvFields = z.object({
  csv: z
    .string({ required_error: 'Choose a CSV file or paste its rows.' })
    .max(MAX_CSV_CHARS, `The CSV text is too long (at most ${MAX_CSV_CHARS} characters).`)
    .refine((t) => t.trim() !== '', 'Choose a CSV file or paste its rows.'),
  role: roleField,
  cohortId: cohortField,
  attendingIds: attendingsField,
});

/** The CSV form, without the request id. */
export const inviteCsvFormSchema = inviteCsvFields.superRefine(attendingsForStudents);
export type InviteCsvForm = z.input<typeof inviteCsvFormSchema>;

/** POST /api/invitations/csv: rows of `name,email` (a header row is allowed). */
export const inviteCsvSchema = inviteCsvFields.extend({ id: requestId }).strict().superRefine(attendingsForStudents);
export type InviteCsvRequest = z.input<typeof inviteCsvSchema>;

/** POST /api/invitations/{invitationId}/resend and …/revoke. */
export const invitationActionSchema = z.object({ id: requestId }).strict();

/** POST /api/invitations/{token}/accept. */
export const acceptSchema = z.object({ id: requestId, name: nameField, password: passwordField }).strict();
/** The invitation page's form: the password typed twice. */
export const acceptFormSchema = z
  .object({ name: nameField, password: passwordField, confirm: z.string() })
  .refine((v) => v.password === v.confirm, { path: ['confirm'], message: 'The two passwords are not the same.' });
export type AcceptRequest = z.input<typeof acceptSchema>;

/** POST /api/password-resets. */
export const resetRequestSchema = z.object({ id: requestId, email: emailField }).strict();

/** The forgotten-password form. */
export const resetRequestFormSchema = z.object({ email: emailField });

/** POST /api/password-resets/{token}. */
export const resetConfirmSchema = z.object({ id: requestId, password: passwordField }).strict();
/** The reset page's form: the password typed twice. */
export const resetConfirmFormSchema = z
  .object({ password: passwordField, confirm: z.string() })
  .refine((v) => v.password === v.confirm, { path: ['confirm'], message: 'The two passwords are not the same.' });

/** POST /api/users/{userId}/password-reset (a director sends the link). */
export const directorResetSchema = z.object({ id: requestId }).strict();

// --- answers ----------------------------------------------------------------------------

export type InvitationStatus = 'pending' | 'accepted' | 'expired' | 'revoked';

/** One invitation in the director's list (GET /api/invitations). */
export interface InvitationView {
  invitationId: number;
  email: string;
  name: string | null;
  role: Role;
  cohortId: number | null;
  cohortName: string | null;
  attendingIds: number[];
  status: InvitationStatus;
  invitedBy: string;
  createdAt: string;
  expiresAt: string;
  acceptedAt: string | null;
  revokedAt: string | null;
  sentCount: number;
}

/** What became of one CSV row. */
export type CsvRowStatus = 'invited' | 'has-account' | 'already-invited' | 'duplicate' | 'bad-email' | 'refused';

export interface CsvRowResult {
  /** The row's line in the file, from 1 (a header row counts). */
  line: number;
  name: string;
  email: string;
  status: CsvRowStatus;
  /** The words shown beside the row. */
  message: string;
  invitationId?: number;
}

/** The answer of POST /api/invitations/csv. */
export interface CsvAnswer {
  rows: CsvRowResult[];
  invited: number;
}

/** A 400 answer: the message, and the field it is about when there is one. */
export interface FieldError {
  error: string;
  field?: string;
}
