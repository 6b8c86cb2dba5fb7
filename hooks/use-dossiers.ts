import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { DossierCreate, ProductCreate } from '../shared/schema/workflow';
import { apiGet, apiSend } from './api';
import { keys } from './query-keys';
import type { DossierListFilter } from '../shared/schema/lists';
import type { Dossier, DossierListItem, Overview, OverviewList, Page, Product, Revision, RevisionSummary } from './types';
import { usePaged } from './use-paged';

export function useOverview() {
  return useQuery({ queryKey: keys.overview, queryFn: () => apiGet<Overview>('/overview') });
}

export function useProducts() {
  return useQuery({ queryKey: keys.products, queryFn: () => apiGet<Product[]>('/products') });
}

export function useCreateProduct() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (body: ProductCreate) => apiSend<Product>('POST', '/products', body),
    onSuccess: () => client.invalidateQueries({ queryKey: keys.products }),
  });
}

/** The dossier list, newest first, a page at a time; `filter` (text, product, status) is applied by the server. */
export function useDossiers(filter: DossierListFilter = {}) {
  return usePaged<DossierListItem>(keys.dossierList(filter), '/dossiers', filter);
}

/** More of one Overview list, starting from the first page the Overview answered. */
export function useOverviewList(list: OverviewList, first: Page<RevisionSummary>) {
  return usePaged<RevisionSummary>(keys.overviewList(list), `/overview/${list}`, {}, first);
}

export function useDossier(id: number) {
  return useQuery({ queryKey: keys.dossier(id), queryFn: () => apiGet<Dossier>(`/dossiers/${id}`), enabled: Number.isFinite(id) });
}

export function useCreateDossier() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (body: DossierCreate) => apiSend<Dossier>('POST', '/dossiers', body),
    onSuccess: () => {
      void client.invalidateQueries({ queryKey: keys.dossiers });
      void client.invalidateQueries({ queryKey: keys.products });
      void client.invalidateQueries({ queryKey: keys.overview });
    },
  });
}

export function useStartRevision(dossierId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (fromRevisionId?: number) => apiSend<Revision>('POST', `/dossiers/${dossierId}/revisions`, fromRevisionId ? { fromRevisionId } : {}),
    onSuccess: () => {
      void client.invalidateQueries({ queryKey: keys.dossier(dossierId) });
      void client.invalidateQueries({ queryKey: keys.dossiers });
      void client.invalidateQueries({ queryKey: keys.overview });
    },
  });
}
