import { useQuery } from '@tanstack/react-query';
import { useMemo } from 'react';
import { computeDischarge } from '../shared/engine';
import { dischargeInputSchema, type DesignDraft, type DischargeResult, type RequirementDraft } from '../shared/schema/discharge';
import { ApiError, apiSend, type FieldError } from './api';
import { keys } from './query-keys';
import { useSettled } from './use-settled';

/** Pause after the last keystroke before asking the server, so half-typed values are not sent. */
const SETTLE_MS = 300;

export interface CalcDraft {
  requirement: RequirementDraft;
  design: DesignDraft;
}

export interface CalcState {
  /** The server's result for the current input when it has answered, else the in-browser preview. */
  result: DischargeResult;
  /**
   * "server": the authoritative answer for exactly this input. "preview": the same engine run in the
   * browser while the server has not answered yet. "local": the server is not asked because the input
   * cannot be sent yet (the requirement is unfinished or a value is out of range); the engine's
   * incomplete verdict says what is missing.
   */
  source: 'server' | 'preview' | 'local';
  /** True while typing has not settled or the server is answering. */
  working: boolean;
  /** Why the server could not answer (refused input, network), null when it did. */
  error: Error | null;
  /** Field problems the server reported, paths like "design.bleeder.resistance". */
  fieldErrors: FieldError[];
}

/**
 * Live discharge check (`POST /api/calc/discharge`) for a draft. Results show at once from the shared
 * engine and are replaced by the server's answer once typing settles; the server's is the one that
 * counts. A query rather than a mutation: the result is a pure function of the input.
 */
export function useCalc(draft: CalcDraft): CalcState {
  // Compared by content, so a re-render with an equal object neither recomputes nor restarts the pause.
  const key = JSON.stringify(draft);
  const preview = useMemo(() => computeDischarge(JSON.parse(key) as CalcDraft), [key]);
  const settledKey = useSettled(key, SETTLE_MS);
  const sendable = useMemo(() => {
    const parsed = dischargeInputSchema.safeParse(JSON.parse(settledKey));
    return parsed.success ? parsed.data : null;
  }, [settledKey]);

  const query = useQuery({
    queryKey: keys.calcDischarge(sendable),
    queryFn: () => apiSend<DischargeResult>('POST', '/calc/discharge', sendable),
    enabled: sendable !== null,
    staleTime: Infinity,
  });

  const settled = settledKey === key;
  const answered = settled && sendable !== null && query.data !== undefined;
  const error = settled ? query.error : null;
  return {
    result: answered && query.data ? query.data : preview,
    source: answered ? 'server' : settled && sendable === null ? 'local' : 'preview',
    working: !settled || query.isFetching,
    error,
    fieldErrors: error instanceof ApiError ? error.fields : [],
  };
}
