import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { ArchiveEntryView, ArchiveQuery } from '@shared/schemas/review.schema';
import { api } from '@/lib/api-client';

export function getArchive(query: ArchiveQuery): Promise<ArchiveEntryView[]> {
  return api.get<ArchiveEntryView[]>('/api/archive', { query: { q: query.q || undefined, superseded: query.superseded } });
}

export function getArchiveQueryOptions(query: ArchiveQuery) {
  return queryOptions({
    queryKey: ['archive', { q: query.q ?? '', superseded: query.superseded ?? 'include' }],
    queryFn: () => getArchive(query),
  });
}

/** Issued (and, unless excluded, superseded) sheets across every project matching the search. */
export function useArchive(query: ArchiveQuery) {
  // The table keeps its rows while the next search is on its way.
  return useQuery({ ...getArchiveQueryOptions(query), placeholderData: keepPreviousData });
}

/** The exact archived bytes of an issued revision. */
export function archivedPdfUrl(sheetId: number): string {
  return `/api/sheets/${sheetId}/pdf`;
}
