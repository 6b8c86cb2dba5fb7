import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { DesignDraft } from '../shared/schema/discharge';
import type { RevisionView } from '../shared/schema/api';
import { ApiError, apiGet, apiSend } from './api';
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

/** The server's answer to a write based on an older version: the revision as it is stored now. */
export function staleRevision(err: unknown): RevisionView | null {
  return err instanceof ApiError && err.code === 'stale_version' ? ((err.body as { current?: RevisionView } | null)?.current ?? null) : null;
}

/** Puts a revision the server answered with into the page's copy without a refetch flicker while typing. */
export function useStoreRevision(id: number) {
  const client = useQueryClient();
  return (rev: RevisionView) => client.setQueryData<Revision>(keys.revision(id), (old) => (old ? { ...old, ...rev } : old));
}

/** Saves a draft's inputs and notes on top of the version they were based on (409 when it is not the stored one). */
export function useSaveRevision(id: number) {
  const client = useQueryClient();
  const store = useStoreRevision(id);
  const invalidate = useInvalidateRevision();
  return useMutation({
    mutationFn: (body: { version: number; design?: DesignDraft; notes?: string }) => apiSend<Revision>('PATCH', `/revisions/${id}`, body),
    onSuccess: (rev) => {
      store(rev);
      void client.invalidateQueries({ queryKey: keys.diffs(id) });
      void client.invalidateQueries({ queryKey: keys.dossier(rev.dossierId) });
      void client.invalidateQueries({ queryKey: keys.overview });
    },
    // A stale save is the caller's to resolve with the stored revision it carries; other failures refetch.
    onError: (err) => {
      if (!staleRevision(err)) invalidate({ id, dossierId: client.getQueryData<Revision>(keys.revision(id))?.dossierId ?? -1 });
    },
  });
}

/** Submits the version the author is looking at; a newer stored one answers 409 instead of being frozen unseen. */
export function useSubmitRevision(id: number) {
  const client = useQueryClient();
  const invalidate = useInvalidateRevision();
  return useMutation({
    mutationFn: () => apiSend<Revision>('POST', `/revisions/${id}/submit`, { version: client.getQueryData<Revision>(keys.revision(id))?.version }),
    onSuccess: invalidate,
    onError: () => invalidate({ id, dossierId: client.getQueryData<Revision>(keys.revision(id))?.dossierId ?? -1 }),
  });
}

export function useDecideRevision(id: number) {
  const invalidate = useInvalidateRevision();
  return useMutation({
    mutationFn: (body: { decision: 'approve' | 'return'; comment: string; password?: string }) =>
      apiSend<Revision>('POST', `/revisions/${id}/decision`, body),
    onSuccess: invalidate,
  });
}

export function useAddComment(id: number) {
  const invalidate = useInvalidateRevision();
  return useMutation({ mutationFn: (body: string) => apiSend<Revision>('POST', `/revisions/${id}/comments`, { body }), onSuccess: invalidate });
}

/** How revision `id` differs from revision `against` of the same dossier; idle while `against` is unknown. */
export function useRevisionDiff(id: number, against: number | undefined) {
  return useQuery({
    queryKey: keys.diff(id, against),
    queryFn: () => apiGet<RevisionDiff>(`/revisions/${id}/diff?against=${against}`),
    enabled: against !== undefined,
  });
}

/** Revisions awaiting a decision, oldest first, a page at a time. */
export function useReviewQueue() {
  return usePaged<ReviewQueueItem>(keys.reviews, '/reviews');
}

export function useAudit(dossierId: number, enabled: boolean) {
  return useQuery({ queryKey: keys.audit(dossierId), queryFn: () => apiGet<AuditReport>(`/audit?dossierId=${dossierId}`), enabled });
}
