import { useId, useState, type SubmitEvent } from 'react';
import type { QueueSort, QueueState, ToothGroupName } from '../../../lib/contract';
import { DEFAULT_FILTERS, type QueueFilters } from './queueApi';
import { BUTTON, FIELD } from './words';

const STATE_WORDS: Readonly<Record<QueueState, string>> = {
  'needs-action': 'Needs action',
  open: 'In progress',
  returned: 'Returned',
  approved: 'Signed off',
  all: 'All cases',
};
const TOOTH_WORDS: Readonly<Record<'' | ToothGroupName, string>> = {
  '': 'Any tooth',
  anterior: 'Anterior',
  premolar: 'Premolar',
  molar: 'Molar',
};
const STOP_WORDS = { '': 'Any', true: 'With open stops', false: 'No open stops' } as const;
export const SORT_WORDS: Readonly<Record<QueueSort, string>> = {
  waiting: 'Waiting longest',
  student: 'Student',
  tooth: 'Tooth',
  stops: 'Most stops',
};

interface Props {
  filters: QueueFilters;
  students: readonly { id: number; name: string }[];
  onChange: (filters: QueueFilters) => void;
}

/** The queue's filters, sent to the API as they change (the chart number when searched). */
export function QueueFiltersForm({ filters, students, onChange }: Props) {
  const id = useId();
  const [chart, setChart] = useState(filters.q);
  const set = <K extends keyof QueueFilters>(key: K, value: QueueFilters[K]) => onChange({ ...filters, [key]: value });

  function search(ev: SubmitEvent<HTMLFormElement>) {
    // Never a real form submission: the chart number must not land in the page's address.
    ev.preventDefault();
    set('q', chart.trim());
  }

  const select = (
    key: 'state' | 'student' | 'toothGroup' | 'hasStops' | 'sort',
    label: string,
    options: [string, string][],
  ) => (
    <div>
      <label htmlFor={`${id}-${key}`} className="block text-sm font-bold mb-1">
        {label}
      </label>
      <select
        id={`${id}-${key}`}
        className={FIELD}
        value={filters[key]}
        onChange={(e) => set(key, e.target.value as never)}
      >
        {options.map(([value, words]) => (
          <option key={value} value={value}>
            {words}
          </option>
        ))}
      </select>
    </div>
  );

  return (
    <form role="search" aria-label="Filter the queue" onSubmit={search} className="mb-5">
      <div className="grid gap-3 grid-cols-2 lg:grid-cols-5">
        {select('state', 'Show', Object.entries(STATE_WORDS))}
        {select('student', 'Student', [
          ['', 'Any student'],
          ...students.map((s): [string, string] => [String(s.id), s.name]),
        ])}
        {select('toothGroup', 'Tooth', Object.entries(TOOTH_WORDS))}
        {select('hasStops', 'Open stops', Object.entries(STOP_WORDS))}
        {select('sort', 'Order', Object.entries(SORT_WORDS))}
      </div>
      <div className="mt-3 flex flex-wrap items-end gap-2">
        <div className="grow basis-40">
          <label htmlFor={`${id}-q`} className="block text-sm font-bold mb-1">
            Chart number
          </label>
          <input
            id={`${id}-q`}
            type="search"
            className={FIELD}
            autoComplete="off"
            spellCheck={false}
            maxLength={64}
            value={chart}
            onChange={(e) => setChart(e.target.value)}
          />
        </div>
        <button type="submit" className={BUTTON.primary}>
          Search
        </button>
        <button
          type="button"
          className={BUTTON.plain}
          onClick={() => {
            setChart('');
            onChange({ ...DEFAULT_FILTERS });
          }}
        >
          Clear
        </button>
      </div>
    </form>
  );
}
