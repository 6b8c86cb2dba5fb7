import { computeRevisionResults as compute } from '../../shared/engine/revision-results';
import type { DesignDraft, DischargeResult, Requirement } from '../../shared/schema/discharge';
import type { EvidenceRecord } from './store';

/** The stored results of a revision: its inputs plus the analysed captures among its evidence. */
export function computeRevisionResults(requirement: Requirement, design: DesignDraft, evidence: readonly EvidenceRecord[]): DischargeResult {
  const captures = evidence
    .filter((e) => e.analysis)
    .map((e) => ({ evidenceId: e.id, sha256: e.sha256, name: e.originalName, analysis: e.analysis! }));
  return compute(requirement, design, captures);
}
