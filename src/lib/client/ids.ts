import { v4 as uuidv4 } from 'uuid';

/**
 * A fresh UUID v4 for an event, case or canal.
 * `crypto.randomUUID` exists only in a secure context (HTTPS or localhost); a tablet on a
 * plain-HTTP demo network falls back to the uuid package (docs/sync-contract.md, "Secure context").
 */
export function newId(): string {
  const c = (globalThis as { crypto?: Crypto }).crypto;
  if (c && typeof c.randomUUID === 'function') return c.randomUUID();
  return uuidv4();
}

/** A short device id: "tablet-" plus 12 hex digits, made once per browser. */
export function newDeviceId(): string {
  return `tablet-${newId().replace(/-/g, '').slice(0, 12)}`;
}
