import { useInfiniteQuery, type QueryKey } from '@tanstack/react-query';
import { useMemo } from 'react';
import type { Page } from '../shared/schema/lists';
import { apiGet } from './api';

export type ListParams = Record<string, string | number | undefined>;

/** `/path?a=1&b=x`, leaving out parameters that are not set. */
export function withQuery(path: string, params: ListParams): string {
  const query = new URLSearchParams();
  for (const [name, value] of Object.entries(params)) if (value !== undefined && value !== '') query.set(name, String(value));
  const text = query.toString();
  return text ? `${path}?${text}` : path;
}

export interface PagedList<T> {
  items: T[];
  /** How many match in all (null until the first page arrived). */
  total: number | null;
  hasMore: boolean;
  loadMore: () => void;
  loadingMore: boolean;
  isLoading: boolean;
  error: Error | null;
}

/**
 * A paged list route (`{ items, nextCursor, total }`) as one growing list: `loadMore` fetches the next
 * page. Filters go in `params` and into the key, so a new filter starts again from the first page.
 * `first` seeds the list with a page the caller already has (the Overview answers every list's first).
 */
export function usePaged<T>(queryKey: QueryKey, path: string, params: ListParams = {}, first?: Page<T>): PagedList<T> {
  const query = useInfiniteQuery({
    queryKey,
    queryFn: ({ pageParam }) => apiGet<Page<T>>(withQuery(path, { ...params, cursor: pageParam ?? undefined })),
    initialPageParam: null as string | null,
    getNextPageParam: (last) => last.nextCursor,
    // A seeded first page is as fresh as the answer it came in, so mounting does not fetch it again.
    ...(first ? { initialData: { pages: [first], pageParams: [null] }, staleTime: 30_000 } : {}),
  });
  const items = useMemo(() => query.data?.pages.flatMap((p) => p.items) ?? [], [query.data]);
  return {
    items,
    total: query.data?.pages[0]?.total ?? null,
    hasMore: query.hasNextPage,
    loadMore: () => void query.fetchNextPage(),
    loadingMore: query.isFetchingNextPage,
    isLoading: query.isLoading,
    error: query.error,
  };
}
