import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  useReactTable,
  type SortingState,
} from '@tanstack/react-table';
import { useMemo } from 'react';
import type { QueueRow, QueueSort } from '../../../lib/contract';
import { formatAgo, formatInstant, type Clinic } from '../../../lib/present/format';
import { REVIEW_LABEL, SETTING_LABEL } from '../../../lib/present/labels';
import { canalCount, caseTitle, SINCE_WORD } from './words';

interface Props {
  rows: QueueRow[];
  sort: QueueSort;
  onSort: (sort: QueueSort) => void;
  clinic: Clinic;
  now: number;
}

const SORT_OF_COLUMN: Partial<Record<string, QueueSort>> = {
  student: 'student',
  tooth: 'tooth',
  waiting: 'waiting',
  findings: 'stops',
};
/** The order each sortable column gives (the server's; the table never sorts rows itself). */
const DESCENDING: Readonly<Record<QueueSort, boolean>> = { waiting: false, student: false, tooth: false, stops: true };

const column = createColumnHelper<QueueRow>();

function Tooth({ row }: { row: QueueRow }) {
  return (
    <span className="tabular">
      {row.tooth ?? 'Block'} <span className="text-muted text-sm">· {canalCount(row.canals)}</span>
    </span>
  );
}

function Since({ row, clinic, now }: { row: QueueRow; clinic: Clinic; now: number }) {
  return (
    <span>
      {SINCE_WORD[row.since.kind]} {formatAgo(row.since.at, now, clinic)}
      <span className="block text-sm text-muted tabular">{formatInstant(row.since.at, clinic)}</span>
    </span>
  );
}

function Findings({ row }: { row: QueueRow }) {
  if (row.stops + row.cautions === 0) return <span className="text-muted">none open</span>;
  return (
    <span className="tabular">
      {row.stops > 0 && (
        <span className="text-stop font-bold mr-2">
          ■ {row.stops} stop{row.stops === 1 ? '' : 's'}
        </span>
      )}
      {row.cautions > 0 && (
        <span className="text-caution font-bold">
          ▲ {row.cautions} caution{row.cautions === 1 ? '' : 's'}
        </span>
      )}
    </span>
  );
}

function State({ row }: { row: QueueRow }) {
  return (
    <span>
      {REVIEW_LABEL[row.state]}
      {row.coneFits.length > 0 && (
        <span className="block text-sm font-bold text-gutta-strong">
          {row.coneFits.length} cone fit{row.coneFits.length === 1 ? '' : 's'} waiting
        </span>
      )}
    </span>
  );
}

const openLabel = (row: QueueRow) => `Open ${row.student.name}'s case, ${caseTitle(row)}`;

/**
 * The queue's rows in the server's order: a table on a wide screen, cards on a phone. TanStack
 * Table holds the columns and the sort state; sorting itself is the server's (a new query).
 */
export function QueueTable({ rows, sort, onSort, clinic, now }: Props) {
  const columns = useMemo(
    () => [
      column.accessor((r) => r.student.name, { id: 'student', header: 'Student' }),
      column.display({ id: 'tooth', header: 'Tooth', cell: (c) => <Tooth row={c.row.original} /> }),
      column.accessor((r) => SETTING_LABEL[r.setting], {
        id: 'setting',
        header: 'Setting',
        enableSorting: false,
        cell: (c) => (
          <>
            {c.getValue()}
            {c.row.original.chartRef && (
              <span className="block text-sm text-muted">chart {c.row.original.chartRef}</span>
            )}
          </>
        ),
      }),
      column.display({
        id: 'waiting',
        header: 'Waiting since',
        cell: (c) => <Since row={c.row.original} clinic={clinic} now={now} />,
      }),
      column.display({
        id: 'findings',
        header: 'Open stops and cautions',
        cell: (c) => <Findings row={c.row.original} />,
      }),
      column.accessor('unfilled', {
        header: 'Unfilled canals',
        enableSorting: false,
        cell: (c) => <span className="tabular">{c.getValue()}</span>,
      }),
      column.display({
        id: 'state',
        header: 'State',
        enableSorting: false,
        cell: (c) => <State row={c.row.original} />,
      }),
      column.display({
        id: 'open',
        header: () => <span className="sr-only">Open</span>,
        enableSorting: false,
        cell: (c) => (
          <a
            className="inline-flex items-center min-h-12 min-w-12 underline font-bold"
            href={`/cases/${c.row.original.caseId}`}
            aria-label={openLabel(c.row.original)}
          >
            Open
          </a>
        ),
      }),
    ],
    [clinic, now],
  );
  const sorting: SortingState = [
    { id: Object.entries(SORT_OF_COLUMN).find(([, s]) => s === sort)![0], desc: DESCENDING[sort] },
  ];
  // This build has no React Compiler, so nothing memoises around the table's functions.
  // eslint-disable-next-line react-hooks/incompatible-library
  const table = useReactTable({
    data: rows,
    columns,
    getCoreRowModel: getCoreRowModel(),
    getRowId: (r) => r.caseId,
    manualSorting: true,
    enableSortingRemoval: false,
    state: { sorting },
    onSortingChange: (update) => {
      const next = typeof update === 'function' ? update(sorting) : update;
      const chosen = next[0] && SORT_OF_COLUMN[next[0].id];
      if (chosen) onSort(chosen);
    },
  });

  return (
    <>
      <div className="hidden md:block bg-white border border-line rounded-lg">
        <table className="w-full text-left border-collapse">
          <caption className="sr-only">Cases in the review queue</caption>
          <thead className="bg-paper">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => {
                  const sortable = SORT_OF_COLUMN[header.column.id] !== undefined;
                  const active = header.column.getIsSorted();
                  return (
                    <th
                      key={header.id}
                      scope="col"
                      className="p-3 align-bottom"
                      aria-sort={active === 'asc' ? 'ascending' : active === 'desc' ? 'descending' : undefined}
                    >
                      {sortable ? (
                        <button
                          type="button"
                          className="min-h-12 min-w-12 text-left font-bold underline-offset-4 hover:underline"
                          onClick={() => header.column.toggleSorting(DESCENDING[SORT_OF_COLUMN[header.column.id]!])}
                        >
                          {flexRender(header.column.columnDef.header, header.getContext())}
                          <span aria-hidden="true">{active ? (active === 'desc' ? ' ▼' : ' ▲') : ''}</span>
                        </button>
                      ) : (
                        flexRender(header.column.columnDef.header, header.getContext())
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className="border-t border-line align-top">
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className="p-3">
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>

      <ul className="md:hidden grid gap-3" aria-label="Cases in the review queue">
        {table.getRowModel().rows.map(({ original: row }) => (
          <li key={row.caseId} className="bg-white border border-line rounded-lg p-4">
            <div className="flex flex-wrap items-baseline justify-between gap-x-3">
              <p className="font-bold text-lg">{row.student.name}</p>
              <State row={row} />
            </div>
            <p>
              {row.tooth === null ? 'Training block' : `Tooth ${row.tooth}`} · {canalCount(row.canals)}
              {row.tooth !== null && ` · ${SETTING_LABEL[row.setting]}`}
              {row.chartRef && <span className="text-muted"> · chart {row.chartRef}</span>}
            </p>
            <p className="mt-1">
              <Since row={row} clinic={clinic} now={now} />
            </p>
            <p className="mt-1">
              <Findings row={row} />
              {row.unfilled > 0 && <span> · {canalCount(row.unfilled)} unfilled</span>}
            </p>
            <a
              className="mt-3 flex items-center justify-center min-h-12 rounded-lg border-2 border-ink font-bold no-underline"
              href={`/cases/${row.caseId}`}
              aria-label={openLabel(row)}
            >
              Open the case
            </a>
          </li>
        ))}
      </ul>
    </>
  );
}
