import {
  keepPreviousData,
  QueryClient,
  QueryClientProvider,
  useInfiniteQuery,
  useQueryClient,
} from '@tanstack/react-query';
import { useEffect, useState } from 'react';
import type { QueueAnswer } from '../../../lib/contract';
import { formatInstant, type Clinic } from '../../../lib/present/format';
import { ConeFitList } from './ConeFitList';
import { ApiError, DEFAULT_FILTERS, fetchQueue, sameFilters, type QueueFilters } from './queueApi';
import { QueueFiltersForm } from './QueueFilters';
import { QueueTable } from './QueueTable';
import { BUTTON } from './words';

export interface ReviewQueueProps {
  /** The first page with the default filters, read on the server by the same service as the API. */
  initial: QueueAnswer;
  students: { id: number; name: string }[];
  clinic: Clinic;
  /** When the server read the first page (ISO): the island's clock starts from it, so the server's HTML and the first render agree. */
  now: string;
}

/** The review queue island (/review): TanStack Query for the data, TanStack Table for the columns. */
export default function ReviewQueue(props: ReviewQueueProps) {
  const [client] = useState(() => new QueryClient({ defaultOptions: { queries: { retry: 1 } } }));
  return (
    <QueryClientProvider client={client}>
      <Queue {...props} />
    </QueryClientProvider>
  );
}

const REFRESH_MS = 15_000;

function Queue({ initial, students, clinic, now: readAt }: ReviewQueueProps) {
  const queryClient = useQueryClient();
  const [filters, setFilters] = useState<QueueFilters>({ ...DEFAULT_FILTERS });
  const [now, setNow] = useState(() => Date.parse(readAt));
  const [notice, setNotice] = useState<string | null>(null);
  useEffect(() => {
    const timer = setInterval(() => setNow(Date.now()), 30_000);
    return () => clearInterval(timer);
  }, []);

  const isDefault = sameFilters(filters, DEFAULT_FILTERS);
  const query = useInfiniteQuery({
    queryKey: ['review-queue', filters],
    queryFn: ({ pageParam, signal }) => fetchQueue(filters, pageParam, signal),
    initialPageParam: undefined as string | undefined,
    getNextPageParam: (last) => last.nextCursor ?? undefined,
    initialData: isDefault ? { pages: [initial], pageParams: [undefined] } : undefined,
    initialDataUpdatedAt: Date.parse(readAt),
    placeholderData: keepPreviousData,
    refetchInterval: REFRESH_MS,
    refetchOnWindowFocus: true,
  });
  const rows = query.data?.pages.flatMap((p) => p.rows) ?? [];
  const updatedAt = query.dataUpdatedAt;

  const decided = (message: string) => {
    setNotice(message);
    void queryClient.invalidateQueries({ queryKey: ['review-queue'] });
  };

  const filtered = !sameFilters({ ...filters, sort: 'waiting' }, DEFAULT_FILTERS);
  const failed =
    query.error instanceof ApiError ? query.error : query.error ? new ApiError(0, query.error.message) : null;

  return (
    <div>
      <QueueFiltersForm filters={filters} students={students} onChange={setFilters} />
      <p role="status" className={notice ? 'mb-4 rounded-lg border-2 border-ink bg-white p-3 font-bold' : 'sr-only'}>
        {notice}
      </p>
      {failed && (
        <p role="alert" className="mb-4 rounded-lg border-2 border-stop bg-white p-3">
          {failed.status === 401 ? (
            <>
              Your session has ended. <a href="/signin?callbackUrl=%2Freview">Sign in again</a> to see the queue.
            </>
          ) : (
            <>The queue could not be refreshed: {failed.message} It tries again every 15 seconds.</>
          )}
        </p>
      )}
      <ConeFitList rows={rows} clinic={clinic} now={now} onDecided={decided} />
      {query.isPending ? (
        <p>Loading the queue…</p>
      ) : rows.length === 0 ? (
        <div className="bg-white border border-line rounded-lg p-4">
          {filtered ? (
            <p>No case matches these filters.</p>
          ) : (
            <p>
              Nothing needs you now: no case is waiting for review and no cone fit is waiting for approval. New ones
              appear here on their own.
            </p>
          )}
        </div>
      ) : (
        <>
          <h2 className="text-xl font-bold mb-3">
            {filters.state === 'needs-action' ? 'Cases that need you' : 'Cases'}
          </h2>
          <QueueTable
            rows={rows}
            sort={filters.sort}
            onSort={(sort) => setFilters((f) => ({ ...f, sort }))}
            clinic={clinic}
            now={now}
          />
        </>
      )}
      <div className="mt-4 flex flex-wrap items-center gap-3">
        {query.hasNextPage && (
          <button
            type="button"
            className={BUTTON.plain}
            disabled={query.isFetchingNextPage}
            onClick={() => void query.fetchNextPage()}
          >
            {query.isFetchingNextPage ? 'Loading…' : 'Show 50 more'}
          </button>
        )}
        <p className="text-sm text-muted">
          {rows.length} shown · checked{' '}
          {updatedAt ? formatInstant(new Date(updatedAt).toISOString(), clinic, 'time') : '—'}, again every 15 seconds
        </p>
      </div>
    </div>
  );
}
