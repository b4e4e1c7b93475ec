import { useQuery } from '@tanstack/react-query';
import type { CapturedMessage } from '../../shared/api/schemas';
import { apiRequest } from './client';
import { queryKeys } from './keys';

export function useCapturedMailQuery() {
  return useQuery({
    queryKey: queryKeys.capturedMail,
    queryFn: async () => (await apiRequest<{ messages: CapturedMessage[] }>('GET', '/admin/mail')).messages,
    refetchInterval: 5000,
  });
}
