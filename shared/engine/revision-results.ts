// Everything that decides a revision's verdict, gathered in one place: the discharge checks, each
// snubber's checks, the accessible snubbers' stored energy, and each analysed capture's measured checks.
import type { Check, DesignDraft, DischargeResult, Requirement } from '../schema/discharge';
import { snubberSchema, type Snubber } from '../schema/snubber';
import type { WaveformAnalysis } from '../schema/waveform';
import { formatQuantity } from '../units';
import { completeInput, computeDischarge } from './compute';
import { networkCorners } from './network';
import { measuredDischargeCheck } from './measured';
import { snubberChecks, snubberMissingInputs, snubberStoredEnergy } from './snubber';

export interface MeasuredCapture {
  name: string;
  analysis: WaveformAnalysis;
}

function snubberEnergyCheck(snubbers: readonly Snubber[], requirement: Requirement, busVoltage: number | undefined): Check | null {
  const inventory = snubberStoredEnergy(snubbers, busVoltage);
  if (inventory.entries.length === 0) return null;
  const limit = requirement.maxEnergy ?? null;
  const names = inventory.entries.map((e) => `${e.name} ${formatQuantity(e.energy, 'J')}`).join(', ');
  return {
    id: 'snubber-energy',
    label: 'Energy in accessible snubber capacitors at switch-off',
    value: inventory.total,
    limit,
    unit: 'J',
    pass: limit === null ? true : inventory.total <= limit,
    margin: limit === null ? null : (limit - inventory.total) / limit,
    detail: `½·C·V² at C + tolerance: ${names}${limit === null ? '; shown for the inventory, no energy limit set' : ''}`,
  };
}

/**
 * computeRevisionResults: the discharge engine on the inputs, plus snubber and measured checks, and the
 * verdict over all of them (incomplete while any input a check needs is missing).
 */
export function computeRevisionResults(
  requirement: Requirement,
  design: DesignDraft,
  captures: readonly MeasuredCapture[] = [],
): DischargeResult {
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
    for (const capture of captures) {
      extra.push(
        ...measuredDischargeCheck(capture.analysis, requirement, { nominalTau: base.nominal.tau, worstCaseTau: base.worstCase.tau, toleranceBand }, capture.name),
      );
    }
  }

  const checks = [...base.checks, ...extra];
  const deciding = checks.filter((c) => !c.alternative);
  const verdict = missing.length ? 'incomplete' : deciding.every((c) => c.pass) ? 'meets' : 'fails';
  return { ...base, checks, missing, verdict };
}
