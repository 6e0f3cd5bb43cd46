import { getMeta, setMeta } from './outbox';

/** Whether the browser promised to keep this site's data under storage pressure. */
export type Persistence = 'persisted' | 'refused' | 'unsupported';

type StorageLike = Pick<StorageManager, 'persist' | 'persisted'>;

/**
 * Ask the browser to keep the tablet's data (the outbox) even when the device runs short of
 * storage. Asked once per user after sign-in — some browsers show a prompt, so a refusal is
 * not asked again; later calls only check whether the data is kept.
 */
export async function askToKeepData(
  userId: number,
  storage: StorageLike | undefined = typeof navigator === 'undefined' ? undefined : navigator.storage,
): Promise<Persistence> {
  if (!storage?.persist || !storage.persisted) return 'unsupported';
  try {
    if (await storage.persisted()) return 'persisted';
    const asked = await getMeta<boolean>([userId, 'persistAsked']);
    if (asked) return 'refused';
    await setMeta([userId, 'persistAsked'], true);
    return (await storage.persist()) ? 'persisted' : 'refused';
  } catch {
    return 'unsupported';
  }
}
