/**
 * The review notices (issue 11, item 7): who is told what, in words. To the assigned
 * attendings when a case is submitted or a cone-fit check is asked for; to the student on
 * every return and on the final approval. Each names the tooth, the date the case was opened and a link to it — never the
 * chart number or anything else about the patient, and never the attending's comment (which
 * may mention the patient): the link leads to it behind a sign-in.
 */
import type { Knex } from 'knex';
import { formatInstant, type Clinic } from '../present/format';
import { SETTING_LABEL } from '../present/labels';
import { clinicFromEnv, publicUrlFromEnv } from './config';
import { enqueueMail } from './mail-outbox';
import type { CaseRow } from './tables';

/** What a notice may say about its case: nothing that names the patient. */
export interface NoticeCase {
  id: string;
  setting: CaseRow['setting'];
  tooth: number | null;
  openedAt: string;
  studentName: string;
}

export type NoticeKind = 'submitted' | 'conefit' | 'returned' | 'approved' | 'reopened';

const CHECKPOINT_WORDS = { 'cone-fit': 'cone fit', 'fill-check': 'fill check', final: 'case' } as const;
export type NoticeCheckpoint = keyof typeof CHECKPOINT_WORDS;

/** "tooth 46 (extracted tooth)", or "a training block". */
export function toothWords(c: Pick<NoticeCase, 'setting' | 'tooth'>): string {
  if (c.tooth === null) return `a ${SETTING_LABEL[c.setting].toLowerCase()}`;
  return `tooth ${c.tooth} (${SETTING_LABEL[c.setting].toLowerCase()})`;
}

/** The subject and text of one notice. Pure, so what an e-mail may say is tested directly. */
export function composeNotice(
  kind: NoticeKind,
  c: NoticeCase,
  opts: { clinic: Clinic; publicUrl: string; checkpoint?: NoticeCheckpoint; canalName?: string | null },
): { subject: string; text: string } {
  const tooth = toothWords(c);
  const date = formatInstant(c.openedAt, opts.clinic, 'date');
  // A cone-fit check is answered from the review queue, where it waits at the top.
  const link = kind === 'conefit' ? `${opts.publicUrl}/review` : `${opts.publicUrl}/cases/${c.id}`;
  const what =
    opts.checkpoint && opts.checkpoint !== 'final'
      ? `the ${CHECKPOINT_WORDS[opts.checkpoint]}${opts.canalName ? ` of canal ${opts.canalName}` : ''}`
      : 'your case';
  const lines: Record<NoticeKind, { subject: string; first: string }> = {
    submitted: {
      subject: `Waiting for your review: ${tooth}, ${date}`,
      first: `${c.studentName} submitted a case for your review.`,
    },
    conefit: {
      subject: `Cone fit to check: ${tooth}, ${date}`,
      first: `${c.studentName} asks you to check the cone fit${opts.canalName ? ` of canal ${opts.canalName}` : ''} before sealing. Approve it or return it from your review queue.`,
    },
    returned: {
      subject: `Returned to you: ${tooth}, ${date}`,
      first: `Your attending returned ${what} with a comment on what to put right. Open the case to read it.`,
    },
    approved: {
      subject: `Signed off: ${tooth}, ${date}`,
      first: 'Your attending signed off your case.',
    },
    reopened: {
      subject: `Reopened: ${tooth}, ${date}`,
      first: 'Your attending reopened your signed-off case. Open it to read why.',
    },
  };
  const l = lines[kind];
  return {
    subject: l.subject,
    text: [
      l.first,
      `Tooth: ${tooth}\nOpened: ${date}`,
      kind === 'conefit' ? `Open your review queue: ${link}` : `Open the case: ${link}`,
      '— Coneline',
    ].join('\n\n'),
  };
}

async function noticeCase(trx: Knex, caseId: string): Promise<(NoticeCase & { studentId: number }) | null> {
  // The chart number is deliberately not read.
  const row = (await trx('cases')
    .join('users', 'users.id', 'cases.student_id')
    .where('cases.id', caseId)
    .first('cases.id', 'cases.setting', 'cases.tooth', 'cases.opened_at', 'cases.student_id', 'users.name')) as
    | {
        id: string;
        setting: CaseRow['setting'];
        tooth: number | null;
        opened_at: string;
        student_id: number;
        name: string;
      }
    | undefined;
  if (!row) return null;
  return {
    id: row.id,
    setting: row.setting,
    tooth: row.tooth,
    openedAt: row.opened_at,
    studentName: row.name,
    studentId: row.student_id,
  };
}

/** Tells each active attending assigned to the case's student that it waits for review. */
export async function noticeSubmitted(trx: Knex, caseId: string, at: string): Promise<void> {
  await noticeAttendings(trx, caseId, 'submitted', at);
}

/** Tells each active attending assigned to the case's student that a canal's cone fit waits for their check. */
export async function noticeConeFitRequested(trx: Knex, caseId: string, canalName: string, at: string): Promise<void> {
  await noticeAttendings(trx, caseId, 'conefit', at, canalName);
}

async function noticeAttendings(
  trx: Knex,
  caseId: string,
  kind: 'submitted' | 'conefit',
  at: string,
  canalName?: string,
): Promise<void> {
  const c = await noticeCase(trx, caseId);
  if (!c) return;
  const attendings = (await trx('assignments')
    .join('users', 'users.id', 'assignments.attending_id')
    .where('assignments.student_id', c.studentId)
    .where('users.active', true)
    .select('users.id')) as { id: number }[];
  const clinic = clinicFromEnv();
  const publicUrl = publicUrlFromEnv();
  const n = composeNotice(kind, c, { clinic, publicUrl, canalName });
  for (const a of attendings) await enqueueMail(trx, { recipientId: a.id, caseId, kind, ...n }, at);
}

/** Tells the student of a return (any checkpoint), the final approval or a reopening. */
export async function noticeStudent(
  trx: Knex,
  caseId: string,
  kind: Exclude<NoticeKind, 'submitted' | 'conefit'>,
  at: string,
  detail: { checkpoint?: NoticeCheckpoint; canalName?: string | null } = {},
): Promise<void> {
  const c = await noticeCase(trx, caseId);
  if (!c) return;
  const clinic = clinicFromEnv();
  const publicUrl = publicUrlFromEnv();
  const n = composeNotice(kind, c, { clinic, publicUrl, ...detail });
  await enqueueMail(trx, { recipientId: c.studentId, caseId, kind, ...n }, at);
}
