/**
 * Inviting a cohort from a CSV file of names and e-mail addresses (docs/accounts.md). The text
 * is read with papaparse; each row goes through the same service as one invitation
 * (createInvitation), under a request id of its own derived from the batch's id and the row's
 * line, so sending the same batch again invites nobody twice. Each row's result is answered.
 */
import { createHash } from 'node:crypto';
import type { Knex } from 'knex';
import Papa from 'papaparse';
import {
  inviteSchema,
  MAX_CSV_ROWS,
  type CsvRowResult,
  type CsvRowStatus,
  type InviteCsvRequest,
} from '../account-forms';
import { fieldOf } from './api-body';
import { createInvitation } from './invitations';
import { once, type Answer } from './request-ids';

export interface CsvRow {
  line: number;
  name: string;
  email: string;
}

const isEmailHeader = (cell: string) => /^e-?mail( address)?$/i.test(cell.trim());

/**
 * The rows of `name,email` CSV text, with their line numbers (from 1). A first row naming its
 * columns (`name`, `email` or `e-mail`, in either order) is read as a header; blank rows are
 * skipped; a row of one cell is an e-mail address with no name.
 */
export function parseInviteCsv(text: string): CsvRow[] {
  const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, ''), { skipEmptyLines: false });
  const rows = parsed.data;
  let nameAt = 0;
  let emailAt = 1;
  let start = 0;
  const first = rows[0]?.map((c) => c.trim().toLowerCase()) ?? [];
  if (first.some(isEmailHeader)) {
    emailAt = first.findIndex(isEmailHeader);
    nameAt = first.findIndex((c) => c === 'name' || c === 'full name');
    start = 1;
  }
  const out: CsvRow[] = [];
  for (let i = start; i < rows.length; i++) {
    const cells = rows[i]!.map((c) => (c ?? '').trim());
    if (cells.every((c) => c === '')) continue;
    if (cells.length === 1) out.push({ line: i + 1, name: '', email: cells[0]! });
    else out.push({ line: i + 1, name: nameAt >= 0 ? (cells[nameAt] ?? '') : '', email: cells[emailAt] ?? '' });
  }
  return out;
}

/**
 * The request id of one row: a UUID (version 8, RFC 9562) made from the batch's id and the
 * row's line, the same each time the batch is sent.
 * @example rowRequestId('6f1c…', 3) // '…-…-8…-…-…', always the same for this batch and line
 */
export function rowRequestId(batchId: string, line: number): string {
  const b = createHash('sha256').update(`${batchId.toLowerCase()}:${line}`).digest();
  b[6] = (b[6]! & 0x0f) | 0x80;
  b[8] = (b[8]! & 0x3f) | 0x80;
  const h = b.subarray(0, 16).toString('hex');
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-${h.slice(12, 16)}-${h.slice(16, 20)}-${h.slice(20, 32)}`;
}

function result(row: CsvRow, status: CsvRowStatus, message: string, invitationId?: number): CsvRowResult {
  return {
    line: row.line,
    name: row.name,
    email: row.email,
    status,
    message,
    ...(invitationId ? { invitationId } : {}),
  };
}

/**
 * Invites every row of the CSV as `input.role` into `input.cohortId` with `input.attendingIds`.
 * 400 (naming the field) when the text has no rows or too many; otherwise 200 with each row's
 * result: invited, already has an account, already invited, a duplicate of an earlier row, a
 * bad e-mail address, or refused (with the reason).
 */
export async function inviteFromCsv(
  k: Knex,
  inviter: { id: number; name: string },
  input: InviteCsvRequest,
  now = new Date(),
): Promise<Answer> {
  const rows = parseInviteCsv(input.csv);
  if (rows.length === 0) return { status: 400, body: { error: 'The CSV has no rows of name,email.', field: 'csv' } };
  if (rows.length > MAX_CSV_ROWS) {
    return {
      status: 400,
      body: { error: `The CSV has ${rows.length} rows; send at most ${MAX_CSV_ROWS} at a time.`, field: 'csv' },
    };
  }
  const results: CsvRowResult[] = [];
  const seen = new Map<string, number>();
  for (const row of rows) {
    const parsed = inviteSchema.safeParse({
      id: rowRequestId(input.id, row.line),
      email: row.email,
      name: row.name || undefined,
      role: input.role,
      cohortId: input.cohortId ?? null,
      attendingIds: input.attendingIds ?? [],
    });
    if (!parsed.success) {
      const field = fieldOf(parsed.error);
      const message = parsed.error.issues[0]?.message ?? 'This row could not be read.';
      results.push(result(row, field === 'email' ? 'bad-email' : 'refused', message));
      continue;
    }
    const invite = parsed.data;
    const earlier = seen.get(invite.email);
    if (earlier !== undefined) {
      results.push(result(row, 'duplicate', `The same address is on line ${earlier}; invited once.`));
      continue;
    }
    seen.set(invite.email, row.line);
    const answer = await once(k, { userId: inviter.id, id: invite.id, route: 'invitations.create', body: invite }, () =>
      createInvitation(k, inviter, invite, now),
    );
    results.push(rowOutcome(row, answer));
  }
  return {
    status: 200,
    body: { rows: results, invited: results.filter((r) => r.status === 'invited').length },
  };
}

function rowOutcome(row: CsvRow, answer: Answer): CsvRowResult {
  const body = answer.body as { error?: string; reason?: string; invitation?: { invitationId: number } };
  if (answer.status === 201) return result(row, 'invited', 'Invitation sent.', body.invitation?.invitationId);
  if (body.reason === 'has-account') return result(row, 'has-account', body.error ?? 'Already has an account.');
  if (body.reason === 'already-invited') return result(row, 'already-invited', body.error ?? 'Already invited.');
  return result(row, 'refused', body.error ?? 'Not invited.');
}
