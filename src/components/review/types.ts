// What the case page hands its islands: words already chosen on the server (src/lib/present),
// so the islands carry no event descriptions or finding catalogue of their own.
import type { Role } from '../../lib/contract';

export type { LineFinding, TimelineLine } from '../../lib/present/timeline';

/** The signed-in reader, as a comment of theirs is shown before the server has it. */
export interface Reader {
  id: number;
  name: string;
  role: Role;
}
