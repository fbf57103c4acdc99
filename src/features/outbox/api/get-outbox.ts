import { queryOptions, useQuery } from '@tanstack/react-query';
import type { OutboxMessageView } from '@shared/schemas/auth.schema';
import { api } from '@/lib/api-client';

/** The messages the local mail sink received, newest first. */
export async function getOutbox(): Promise<OutboxMessageView[]> {
  const messages = await api.get<OutboxMessageView[]>('/api/outbox');
  return [...messages].sort((a, b) => Date.parse(b.receivedAt) - Date.parse(a.receivedAt) || b.id - a.id);
}

export function getOutboxQueryOptions() {
  return queryOptions({ queryKey: ['outbox'], queryFn: getOutbox, staleTime: 0 });
}

export function useOutbox() {
  return useQuery(getOutboxQueryOptions());
}
