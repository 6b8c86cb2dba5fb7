import { keepPreviousData, useQuery } from '@tanstack/react-query';
import type { RingingSizing } from '../shared/engine/snubber';
import type { RingingInputRaw } from '../shared/schema/snubber';
import { apiSend } from './api';
import { keys } from './query-keys';
import { useSettled } from './use-settled';

/** Pause after the last keystroke before asking the server, so half-typed values are not sent. */
const SETTLE_MS = 400;

/**
 * Parasitics and a suggested RC snubber from a ringing measurement, sized by the server
 * (`POST /api/calc/snubber`). `input` is null while the form cannot be sent; the query then idles.
 * A query rather than a mutation: the result is a pure function of the input, so it is cached per input
 * and recomputed as the engineer edits.
 */
export function useSnubberSizing(input: RingingInputRaw | null) {
  // Compared by content, so a re-render with an equal object does not restart the pause.
  const settledKey = useSettled(input === null ? null : JSON.stringify(input), SETTLE_MS);
  const settled = settledKey === null ? null : (JSON.parse(settledKey) as RingingInputRaw);
  const query = useQuery({
    queryKey: keys.snubberSizing(settled),
    queryFn: () => apiSend<RingingSizing>('POST', '/calc/snubber', settled),
    enabled: settled !== null,
    placeholderData: keepPreviousData,
    staleTime: Infinity,
  });
  const current = input !== null && settled !== null;
  return {
    /** The sizing for the settled input; the previous one while a new one is on its way. */
    sizing: current ? query.data : undefined,
    error: current ? query.error : null,
    /** True while typing has not settled or the server is answering. */
    working: input !== null && (JSON.stringify(input) !== settledKey || query.isFetching),
  };
}
