/** The queue island's words and the looks its controls share. */
import type { QueueRow, QueueSinceKind } from '../../../lib/contract';

/** "tooth 36" or "training block". */
export const caseTitle = (row: Pick<QueueRow, 'tooth'>): string =>
  row.tooth === null ? 'training block' : `tooth ${row.tooth}`;

/** What the row's "since" instant is. */
export const SINCE_WORD: Readonly<Record<QueueSinceKind, string>> = {
  submitted: 'Submitted',
  'cone-fit': 'Cone fit asked',
  returned: 'Returned',
  approved: 'Signed off',
  opened: 'Opened',
};

/** "1 canal", "3 canals". */
export const canalCount = (n: number): string => `${n} canal${n === 1 ? '' : 's'}`;

const base =
  'inline-flex items-center justify-center min-h-12 min-w-12 px-4 rounded-lg border-2 font-bold text-base disabled:opacity-60';
/** Large tap targets (48 px): attendings use the queue on a phone on the clinic floor. */
export const BUTTON = {
  primary: `${base} bg-ink text-white border-ink`,
  plain: `${base} bg-white text-ink border-ink`,
  link: `${base} bg-white text-ink border-ink no-underline`,
} as const;

export const FIELD = 'w-full min-h-12 rounded-lg border-2 border-edge bg-white px-3 text-base';
