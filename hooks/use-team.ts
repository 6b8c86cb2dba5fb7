import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { apiGet, apiSend } from './api';
import { keys } from './query-keys';
import type { Role } from './use-me';

export interface TeamMember {
  id: string;
  email: string;
  name: string;
  role: Role;
  disabled: boolean;
  invitePending: boolean;
  /** The latest invitation of someone who has not chosen a password yet. */
  invite: { status: 'open' | 'expired' | 'revoked' | 'used'; expiresAt: string } | null;
  createdAt: string;
}

export function useTeam() {
  return useQuery({ queryKey: keys.users, queryFn: () => apiGet<TeamMember[]>('/users') });
}

export function useInviteUser() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (body: { email: string; name: string; role: Role }) => apiSend<TeamMember>('POST', '/users', body),
    onSuccess: () => client.invalidateQueries({ queryKey: keys.users }),
  });
}

export function useUpdateUser() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: ({ id, ...body }: { id: string; role?: Role; disabled?: boolean }) => apiSend<TeamMember>('PATCH', `/users/${id}`, body),
    onSuccess: () => client.invalidateQueries({ queryKey: keys.users }),
  });
}

/** A fresh one-time invitation link (the earlier one stops working). */
export function useResendInvite() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => apiSend<TeamMember>('POST', `/users/${id}/invite`),
    onSuccess: () => client.invalidateQueries({ queryKey: keys.users }),
  });
}

/** Withdraws a pending invitation: its link stops working. */
export function useRevokeInvite() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => apiSend<TeamMember>('DELETE', `/users/${id}/invite`),
    onSuccess: () => client.invalidateQueries({ queryKey: keys.users }),
  });
}

export interface OutboxMessage {
  id: number;
  from: string;
  to: string;
  subject: string;
  text: string;
  receivedAt: string;
}

export function useOutbox() {
  return useQuery({
    queryKey: keys.outbox,
    queryFn: () =>
      apiGet<{
        messages: OutboxMessage[];
        queued: Array<{ id: number; to: string; subject: string; status: string; attempts: number; lastError: string | null }>;
      }>('/outbox'),
    refetchInterval: 5_000,
  });
}
