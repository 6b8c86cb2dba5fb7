import { useQuery } from '@tanstack/react-query';
import { apiGet } from './api';
import { keys } from './query-keys';

export type Role = 'admin' | 'engineer' | 'reviewer' | 'viewer';

export interface Me {
  id: string;
  email: string;
  name: string;
  role: Role;
  /** Whether the development Outbox exists (never in production). */
  outbox?: boolean;
}

/** The signed-in user, or null when nobody is signed in. */
export function useMe() {
  return useQuery({
    queryKey: keys.me,
    queryFn: async () => (await apiGet<{ user: Me | null }>('/auth/session')).user,
    staleTime: 60_000,
  });
}
