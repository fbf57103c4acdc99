import { queryOptions, useQuery } from '@tanstack/react-query';
import type { FirmSettings } from '@shared/schemas/project.schema';
import { api } from '@/lib/api-client';

export function getFirm(): Promise<FirmSettings> {
  return api.get<FirmSettings>('/api/firm');
}

export function getFirmQueryOptions() {
  return queryOptions({ queryKey: ['firm'], queryFn: getFirm });
}

export function useFirm() {
  return useQuery(getFirmQueryOptions());
}
