/** The director's screens' data: the accounts and the cohorts, read once with the page and again after each change. */
import { QueryClient, useQuery, useQueryClient } from '@tanstack/react-query';
import type { AccountsAnswer, AccountSummary, CohortsAnswer, CohortSummary, PersonRef } from '../../lib/contract';
import { call } from './api';

export function makeQueryClient(): QueryClient {
  // The page brought fresh data: refetch only when a change of ours says so.
  return new QueryClient({ defaultOptions: { queries: { staleTime: Infinity, retry: 1 } } });
}

async function read<T>(path: string): Promise<T> {
  const reply = await call<T>('GET', path);
  if (!reply.ok || !reply.body) throw new Error(reply.error?.error ?? 'The list could not be read.');
  return reply.body;
}

export function useAccounts(initial: AccountSummary[]): AccountSummary[] {
  const q = useQuery({
    queryKey: ['accounts'],
    queryFn: async () => (await read<AccountsAnswer>('/api/users')).accounts,
    initialData: initial,
  });
  return q.data;
}

export function useCohorts(initial: CohortSummary[]): CohortSummary[] {
  const q = useQuery({
    queryKey: ['cohorts'],
    queryFn: async () => (await read<CohortsAnswer>('/api/cohorts')).cohorts,
    initialData: initial,
  });
  return q.data;
}

/** After a change: read the accounts and cohorts again. */
export function useRefresh(): () => void {
  const client = useQueryClient();
  return () => {
    void client.invalidateQueries({ queryKey: ['accounts'] });
    void client.invalidateQueries({ queryKey: ['cohorts'] });
  };
}

/** Every attending account, as the assignment forms offer them. */
export function attendingsIn(accounts: AccountSummary[]): PersonRef[] {
  return accounts
    .filter((a) => a.role === 'attending')
    .map((a) => ({ userId: a.userId, name: a.name, active: a.active }));
}
