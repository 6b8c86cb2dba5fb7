// Everything that decides a revision's verdict, gathered in one place: the discharge checks, each
// snubber's checks, the accessible snubbers' stored energy, and each analysed capture's measured checks.
import type { Check, DesignDraft, DischargeResult, Requirement } from '../schema/discharge';
import { snubberSchema, type Snubber } from '../schema/snubber';
import type { WaveformAnalysis } from '../schema/waveform';
import { formatQuantity } from '../units';
import { upperLimitCheck } from './check';
import { completeInput, computeDischarge } from './compute';
import { networkCorners } from './network';
import { measuredDischargeCheck } from './measured';
import { snubberChecks, snubberMissingInputs, snubberStoredEnergy } from './snubber';

/** An analysed capture among a revision's evidence. */
interface MeasuredCapture {
  /** The evidence record's id. */
  evidenceId: number;
  /** SHA-256 of the file (hex): the capture's identity across revisions. */
  sha256: string;
  name: string;
  analysis: WaveformAnalysis;
}

/** Length of the SHA-256 prefix in a measured check's id, `measured-discharge:<12 hex>`. */
const CHECK_ID_SHA_PREFIX = 12;

/**
 * A capture's checks get ids unique within the results and stable for the same file: the kind, then
 * the first 12 hex digits of its SHA-256 (`measured-discharge:1a2b3c4d5e6f`). The same file attached
 * twice gets a running number from its second copy on (`…:2`), in evidence order.
 */
function captureChecks(capture: MeasuredCapture, checks: readonly Check[], seen: Map<string, number>): Check[] {
  const key = capture.sha256.slice(0, CHECK_ID_SHA_PREFIX);
  const copy = (seen.get(key) ?? 0) + 1;
  seen.set(key, copy);
  const suffix = copy === 1 ? key : `${key}:${copy}`;
  return checks.map((c) => ({ ...c, id: `${c.id}:${suffix}`, evidenceId: capture.evidenceId, evidenceSha256: capture.sha256 }));
}

function snubberEnergyCheck(snubbers: readonly Snubber[], requirement: Requirement, busVoltage: number | undefined): Check | null {
  const inventory = snubberStoredEnergy(snubbers, busVoltage);
  if (inventory.entries.length === 0) return null;
  const limit = requirement.maxEnergy ?? null;
  const names = inventory.entries.map((e) => `${e.name} ${formatQuantity(e.energy, 'J')}`).join(', ');
  return upperLimitCheck({
    id: 'snubber-energy',
    label: 'Energy in accessible snubber capacitors at switch-off',
    value: inventory.total,
    limit,
    unit: 'J',
    detail: `½·C·V² at C + tolerance: ${names}${limit === null ? '; shown for the inventory, no energy limit set' : ''}`,
  });
}

/**
 * computeRevisionResults: the discharge engine on the inputs, plus snubber and measured checks, and the
 * verdict over all of them (incomplete while any input a check needs is missing).
 */
export function computeRevisionResults(requirement: Requirement, design: DesignDraft, captures: readonly MeasuredCapture[] = []): DischargeResult {
  const base = computeDischarge({ requirement, design });
  const extra: Check[] = [];
  const missing = [...base.missing];

  // A snubber still being typed has no checks yet; its empty fields make the verdict incomplete.
  const snubbers: Snubber[] = [];
  (design.snubbers ?? []).forEach((draft, i) => {
    const parsed = snubberSchema.safeParse(draft);
    if (!parsed.success) {
      missing.push(...new Set(parsed.error.issues.map((issue) => `design.snubbers.${i}.${String(issue.path[0] ?? '')}`)));
      return;
    }
    snubbers.push(parsed.data);
    extra.push(...snubberChecks(parsed.data).map((c) => ({ ...c, id: `${c.id}:${i}` })));
    missing.push(...snubberMissingInputs(parsed.data).map((field) => `design.snubbers.${i}.${field}`));
  });
  const energy = snubberEnergyCheck(snubbers, requirement, design.bus?.maxVoltage ?? undefined);
  if (energy) extra.push(energy);

  const complete = completeInput({ requirement, design });
  if (base.nominal && base.worstCase && complete.ok) {
    // The fast corner (R and C at their minimum, ageing included) as a fraction below the nominal τ.
    const corners = networkCorners(complete.design);
    const toleranceBand = 1 - (corners.resistance.min * corners.capacitance.min) / (corners.resistance.nominal * corners.capacitance.nominal);
    const conditions = { ...requirement, maxVoltage: complete.design.bus.maxVoltage, capacitanceMin: corners.capacitance.min };
    const predicted = { nominalTau: base.nominal.tau, worstCaseTau: base.worstCase.tau, toleranceBand };
    const seen = new Map<string, number>();
    for (const capture of captures) {
      extra.push(...captureChecks(capture, measuredDischargeCheck(capture.analysis, conditions, predicted, capture.name), seen));
    }
  }

  const checks = [...base.checks, ...extra];
  const deciding = checks.filter((c) => !c.alternative);
  const verdict = missing.length ? 'incomplete' : deciding.every((c) => c.pass) ? 'meets' : 'fails';
  return { ...base, checks, missing, verdict };
}
