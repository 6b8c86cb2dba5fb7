import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { DesignDraft } from '../shared/schema/discharge';
import { apiGet, apiSend } from './api';
import { keys } from './query-keys';
import type { AuditReport, Revision, RevisionDiff, ReviewQueueItem } from './types';
import { usePaged } from './use-paged';

export function useRevision(id: number) {
  return useQuery({ queryKey: keys.revision(id), queryFn: () => apiGet<Revision>(`/revisions/${id}`), enabled: Number.isFinite(id) });
}

/** After any change to a revision, everything listing it is stale. */
function useInvalidateRevision() {
  const client = useQueryClient();
  return (rev: Pick<Revision, 'id' | 'dossierId'>) => {
    void client.invalidateQueries({ queryKey: keys.revision(rev.id) });
    void client.invalidateQueries({ queryKey: keys.dossier(rev.dossierId) });
    void client.invalidateQueries({ queryKey: keys.dossiers });
    void client.invalidateQueries({ queryKey: keys.overview });
    void client.invalidateQueries({ queryKey: keys.reviews });
  };
}

export function useSaveRevision(id: number) {
  const client = useQueryClient();
  const invalidate = useInvalidateRevision();
  return useMutation({
    mutationFn: (body: { design?: DesignDraft; notes?: string }) => apiSend<Revision>('PATCH', `/revisions/${id}`, body),
    onSuccess: (rev) => {
      // Keep the page's own copy fresh without a refetch flicker while typing.
      client.setQueryData<Revision>(keys.revision(id), (old) => (old ? { ...old, ...rev } : old));
      void client.invalidateQueries({ queryKey: keys.dossier(rev.dossierId) });
      void client.invalidateQueries({ queryKey: keys.overview });
    },
    onError: () => invalidate({ id, dossierId: client.getQueryData<Revision>(keys.revision(id))?.dossierId ?? -1 }),
  });
}

export function useSubmitRevision(id: number) {
  const invalidate = useInvalidateRevision();
  return useMutation({ mutationFn: () => apiSend<Revision>('POST', `/revisions/${id}/submit`), onSuccess: invalidate });
}

export function useDecideRevision(id: number) {
  const invalidate = useInvalidateRevision();
  return useMutation({
    mutationFn: (body: { decision: 'approve' | 'return'; comment: string }) => apiSend<Revision>('POST', `/revisions/${id}/decision`, body),
    onSuccess: invalidate,
  });
}

export function useAddComment(id: number) {
  const invalidate = useInvalidateRevision();
  return useMutation({ mutationFn: (body: string) => apiSend<Revision>('POST', `/revisions/${id}/comments`, { body }), onSuccess: invalidate });
}

export function useRevisionDiff(id: number, enabled: boolean) {
  return useQuery({ queryKey: keys.diff(id), queryFn: () => apiGet<RevisionDiff>(`/revisions/${id}/diff`), enabled });
}

/** Revisions awaiting a decision, oldest first, a page at a time. */
export function useReviewQueue() {
  return usePaged<ReviewQueueItem>(keys.reviews, '/reviews');
}

export function useAudit(dossierId: number, enabled: boolean) {
  return useQuery({ queryKey: keys.audit(dossierId), queryFn: () => apiGet<AuditReport>(`/audit?dossierId=${dossierId}`), enabled });
}
