import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { EmailSettings, EmailSettingsUpdate } from '@shared/schemas/email-settings.schema';
import { api } from '@/lib/api-client';

const KEY = ['me', 'email-settings'] as const;

export function getEmailSettings(): Promise<EmailSettings> {
  return api.get<EmailSettings>('/api/me/email-settings');
}

export function useEmailSettings() {
  return useQuery(queryOptions({ queryKey: KEY, queryFn: getEmailSettings }));
}

/** Turns review e-mails on or off for the signed-in person. */
export function useUpdateEmailSettings() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (update: EmailSettingsUpdate) => api.put<EmailSettings>('/api/me/email-settings', update),
    onSuccess: (settings) => queryClient.setQueryData(KEY, settings),
  });
}
