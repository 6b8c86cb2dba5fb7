import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { apiGet, apiSend } from './api';
import { keys } from './query-keys';
import type { Me } from './use-me';

export function useSignIn() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (body: { email: string; password: string }) => apiSend<Me>('POST', '/auth/sign-in', body),
    onSuccess: (me) => {
      client.clear();
      client.setQueryData(keys.me, me);
    },
  });
}

export function useSignOut() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: () => apiSend<{ ok: true }>('POST', '/auth/sign-out'),
    onSettled: () => {
      client.clear();
      client.setQueryData(keys.me, null);
    },
  });
}

export function useInvite(token: string) {
  return useQuery({
    queryKey: keys.invite(token),
    queryFn: () => apiGet<{ email: string; name: string; kind: 'invite' | 'reset' }>(`/auth/invite?token=${encodeURIComponent(token)}`),
    enabled: token.length > 0,
    retry: false,
  });
}

export function useSetPassword() {
  return useMutation({
    mutationFn: (body: { token: string; password: string }) => apiSend<{ ok: true; email: string }>('POST', '/auth/set-password', body),
  });
}

export function useForgotPassword() {
  return useMutation({
    mutationFn: (body: { email: string }) => apiSend<{ ok: true; message: string }>('POST', '/auth/forgot-password', body),
  });
}
