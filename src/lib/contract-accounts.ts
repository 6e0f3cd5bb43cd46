/**
 * The director's accounts, cohorts and assignments: request bodies as zod schemas and answers
 * as types, declared once and imported by the routes, the services, the admin islands (whose
 * forms use these schemas through react-hook-form's zod resolver) and the tests.
 * Kept apart from contract.ts, which the chairside island imports and which must stay free of
 * zod (its first-paint budget); contract.ts re-exports the types. docs/accounts.md is the
 * written form.
 */
import { z } from 'zod';
import { ROLES, type Role } from './contract';

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** The client-made request id every write carries (the same id again answers the first answer). */
export const requestIdSchema = z
  .string({ required_error: 'id is required', invalid_type_error: 'id must be a UUID' })
  .regex(UUID, 'id must be a UUID made by the client for this request');

const rowId = (name: string) =>
  z
    .number({ required_error: `${name} is required`, invalid_type_error: `${name} must be the id of a row` })
    .int(`${name} must be the id of a row`)
    .positive(`${name} must be the id of a row`);

// --- accounts -------------------------------------------------------------------------

/** POST /api/users/{userId}/deactivate, /reactivate and /holds/lift: the request id only. */
export const userActionSchema = z.object({ id: requestIdSchema }).strict();
export type UserAction = z.infer<typeof userActionSchema>;

/** POST /api/users/{userId}/role. */
export const roleChangeSchema = z
  .object({
    id: requestIdSchema,
    role: z.enum(ROLES, { errorMap: () => ({ message: 'Choose student, attending or director.' }) }),
  })
  .strict();
export type RoleChange = z.infer<typeof roleChangeSchema>;

/** POST /api/users/{userId}/cohort: move a student into a cohort, or out of every cohort (null). */
export const cohortMoveSchema = z
  .object({
    id: requestIdSchema,
    cohortId: rowId('cohortId').nullable(),
  })
  .strict();
export type CohortMove = z.infer<typeof cohortMoveSchema>;

/** The most attendings one student may have at once. */
export const MAX_ATTENDINGS_PER_STUDENT = 12;

/** PUT /api/users/{studentId}/assignments: the student's attendings, the whole set. */
export const assignmentsSchema = z
  .object({
    id: requestIdSchema,
    attendingIds: z
      .array(rowId('each of attendingIds'), {
        required_error: 'attendingIds is required',
        invalid_type_error: 'attendingIds must be a list of attending ids',
      })
      .max(MAX_ATTENDINGS_PER_STUDENT, `Choose at most ${MAX_ATTENDINGS_PER_STUDENT} attendings.`)
      .refine((ids) => new Set(ids).size === ids.length, 'attendingIds names an attending twice.'),
  })
  .strict();
export type AssignmentsChange = z.infer<typeof assignmentsSchema>;

// --- cohorts --------------------------------------------------------------------------

const cohortName = z
  .string({ required_error: 'Give the cohort a name.', invalid_type_error: 'The name must be text.' })
  .trim()
  .min(1, 'Give the cohort a name.')
  .max(120, 'A cohort name may be at most 120 characters.');

/** A class year: the year the cohort graduates. */
const graduationYear = z
  .number({ invalid_type_error: 'The class year must be a year, such as 2029.' })
  .int('The class year must be a year, such as 2029.')
  .min(1950, 'The class year must be between 1950 and 2100.')
  .max(2100, 'The class year must be between 1950 and 2100.');

/** POST /api/cohorts. */
export const cohortCreateSchema = z
  .object({
    id: requestIdSchema,
    name: cohortName,
    graduationYear: graduationYear.nullable().optional(),
  })
  .strict();
export type CohortCreate = z.infer<typeof cohortCreateSchema>;

/** PATCH /api/cohorts/{cohortId}: rename, set the class year, archive or bring back. */
export const cohortUpdateSchema = z
  .object({
    id: requestIdSchema,
    name: cohortName.optional(),
    graduationYear: graduationYear.nullable().optional(),
    archived: z.boolean({ invalid_type_error: 'archived must be true or false.' }).optional(),
  })
  .strict()
  .refine((b) => b.name !== undefined || b.graduationYear !== undefined || b.archived !== undefined, {
    message: 'Send name, graduationYear or archived: there is nothing to change.',
    path: ['name'],
  });
export type CohortUpdate = z.infer<typeof cohortUpdateSchema>;

// --- answers --------------------------------------------------------------------------

/** A person named beside an account (an assigned attending or student). */
export interface PersonRef {
  userId: number;
  name: string;
  active: boolean;
}

/** One account as the director's screens show it (GET /api/users). */
export interface AccountSummary {
  userId: number;
  name: string;
  email: string;
  role: Role;
  active: boolean;
  cohort: { cohortId: number; name: string; archived: boolean } | null;
  /** A student's assigned attendings (empty for other roles). */
  attendings: PersonRef[];
  /** An attending's assigned students (empty for other roles). */
  students: PersonRef[];
  /** When the latest sign-in hold on the account ends (from any address); null when none. */
  heldUntil: string | null;
}

/** GET /api/users. */
export interface AccountsAnswer {
  accounts: AccountSummary[];
}

/** A student who has lost an attending (deactivated or no longer an attending), with who is left. */
export interface StudentToReassign {
  userId: number;
  name: string;
  /** The student's other active attendings; empty when nobody is left to review their cases. */
  otherAttendings: PersonRef[];
}

/** POST /api/users/{userId}/deactivate and /reactivate. */
export interface ActiveAnswer {
  user: AccountSummary;
  sessionsEnded: number;
  /** On deactivating an attending: their students, to be given another attending. */
  studentsToReassign: StudentToReassign[];
}

/** POST /api/users/{userId}/role. */
export interface RoleAnswer {
  user: AccountSummary;
  from: Role;
  sessionsEnded: number;
  /** Assignment rows the change removed (attending, student). */
  assignmentsRemoved: { attendingId: number; studentId: number }[];
  /** When an attending stopped being one: their students, to be given another attending. */
  studentsToReassign: StudentToReassign[];
}

/** POST /api/users/{userId}/holds/lift. */
export interface HoldsAnswer {
  user: AccountSummary;
  holdsLifted: number;
}

/** POST /api/users/{userId}/cohort. */
export interface CohortMoveAnswer {
  user: AccountSummary;
  /** False when the student was already there (nothing written). */
  moved: boolean;
}

/** GET and PUT /api/users/{studentId}/assignments. */
export interface AssignmentsAnswer {
  studentId: number;
  attendings: PersonRef[];
  /** PUT only: the attending ids added and removed. */
  added?: number[];
  removed?: number[];
}

/** One cohort (GET /api/cohorts). */
export interface CohortSummary {
  cohortId: number;
  name: string;
  graduationYear: number | null;
  archived: boolean;
  archivedAt: string | null;
  /** Students in it (deactivated ones included). */
  members: number;
}

/** GET /api/cohorts. */
export interface CohortsAnswer {
  cohorts: CohortSummary[];
}

/** POST /api/cohorts and PATCH /api/cohorts/{cohortId}. */
export interface CohortAnswer {
  cohort: CohortSummary;
}
