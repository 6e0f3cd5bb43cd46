import type { EventData, EventType } from '../../lib/contract';
import type { CanalState } from '../../lib/rules/core';
import type { CanalInfo, Setting } from '../../lib/client/derive';

/** What every step card gets: the canal, its state, and a way to record an answer. */
export interface CardProps {
  canal: CanalInfo;
  setting: Setting;
  state: CanalState | null;
  /** Record one event for this canal; `value` is shown big after the tap. */
  rec: <T extends EventType>(type: T, data: EventData<T>, label: string, value?: string) => Promise<void>;
}

/** Sizes offered around a given ISO size (two below, two above), for cone chips. */
export function sizesAround(size: string, iso: readonly string[]): string[] {
  const i = iso.indexOf(size);
  if (i < 0) return iso.slice(3, 9);
  return iso.slice(Math.max(0, i - 2), i + 3);
}

/** Spreader and accessory cone designations offered first: the sizes most used in lateral compaction, so most taps need no scrolling. */
export const CONE_DESIGNATIONS = ['FF', 'MF', 'F', 'M'] as const;
