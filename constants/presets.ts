// Starting points for a requirement and the Quick check example. Preset limits are typical values read
// from the team's domain notes (docs/DOMAIN.md §2); they are offered, never asserted: the user must
// check them against the edition of the standard they work to.
import type { DesignDraft, RequirementDraft } from '../shared/schema/discharge';

/** Shown beside every preset and after every applied preset. */
export const PRESET_CAUTION = 'Typical value — verify against the current edition of the standard';

export interface RequirementPreset {
  id: string;
  /** Short name with the figures, as chosen from the list. */
  label: string;
  /** What the preset fills in; `reference` names the standard family only as a suggestion. */
  values: Required<Pick<RequirementDraft, 'safeVoltage' | 'maxTime' | 'maxEnergy' | 'maxCharge' | 'fallbackMaxTime' | 'condition' | 'reference'>>;
  /** One sentence on where the figure comes from and what to check. */
  note: string;
}

export const REQUIREMENT_PRESETS: readonly RequirementPreset[] = [
  {
    id: 'machinery-cut-off',
    label: 'Machinery, accessible after supply cut-off: 60 V in 5 s',
    values: {
      safeVoltage: 60,
      maxTime: 5,
      maxEnergy: null,
      maxCharge: null,
      fallbackMaxTime: null,
      condition: 'After supply cut-off; live parts with residual voltage become accessible',
      reference: 'IEC 60204-1 family, residual voltages (suggestion — confirm clause and edition)',
    },
    note: 'Machinery practice: 60 V within 5 s; parts storing a small charge may be exempt — see the clause.',
  },
  {
    id: 'plug-pins',
    label: 'Plug pins after withdrawal: 60 V in 1 s',
    values: {
      safeVoltage: 60,
      maxTime: 1,
      maxEnergy: null,
      maxCharge: null,
      fallbackMaxTime: null,
      condition: 'Plug withdrawn; pins exposed',
      reference: 'IEC 60204-1 family, plugs and similar devices (suggestion — confirm clause and edition)',
    },
    note: 'Where 1 s cannot be met, the standard family offers enclosure protection or a warning instead — see the clause.',
  },
  {
    id: 'household-plug',
    label: 'Household appliance plug pins: 34 V in 1 s',
    values: {
      safeVoltage: 34,
      maxTime: 1,
      maxEnergy: null,
      maxCharge: null,
      fallbackMaxTime: null,
      condition: 'Supplied at rated voltage, switched off, disconnected at the voltage peak; measured between plug pins',
      reference: 'IEC 60335-1 family, discharge of capacitors at plug pins (suggestion — confirm clause and edition)',
    },
    note: 'Household practice: 34 V between pins within 1 s; very small capacitors may be exempt — see the clause.',
  },
  {
    id: 'drive-operator',
    label: 'Drive, operator access: 60 V in 5 s',
    values: {
      safeVoltage: 60,
      maxTime: 5,
      maxEnergy: null,
      maxCharge: null,
      fallbackMaxTime: null,
      condition: 'After disconnection from the supply; parts accessible to the operator',
      reference: 'IEC 61800-5-1 family (drives), stored charge (suggestion — clause from memory, confirm it)',
    },
    note: 'Drive practice: 60 V DC within 5 s for operator access; service access may allow longer with a marked wait time.',
  },
  {
    id: 'lab-plug',
    label: 'Laboratory equipment plug pins: 60 V or 45 µC in 5 s',
    values: {
      safeVoltage: 60,
      maxTime: 5,
      maxEnergy: null,
      maxCharge: 45e-6,
      fallbackMaxTime: null,
      condition: 'Cord-connected equipment; plug withdrawn, pins exposed',
      reference: 'IEC 61010-1 family, stored charge at plug pins (suggestion — confirm clause and edition)',
    },
    note: 'Laboratory practice: the stored-charge limit (45 µC) is the pass criterion; 60 V is entered as the voltage figure.',
  },
  {
    id: 'vehicle-active',
    label: 'Vehicle active discharge: 60 V in 2–5 s (fallback minutes)',
    values: {
      safeVoltage: 60,
      maxTime: 2,
      maxEnergy: 0.2,
      maxCharge: null,
      fallbackMaxTime: 120,
      condition: 'Key-off or crash signal; active circuit running, bleeders as the back-up',
      reference: 'Vehicle programme target; ISO 6469 family for the 60 V / 0.2 J criteria (suggestion — confirm edition)',
    },
    note: 'Programmes commonly ask 2–5 s active (2 s entered) and minutes for the bleeders alone (120 s from memory); 0.2 J is the energy alternative.',
  },
];

/**
 * The Quick check's opening example (invented numbers): a 400 V three-phase drive's film DC link,
 * 622 V maximum bus, 2 × 3.3 µF ±5 % in parallel, bled by 2 × 100 kΩ 3 W in series, against the
 * operator-access preset. It meets the checks with about a third in hand, so a first look shows a
 * complete result.
 */
export const EXAMPLE_REQUIREMENT: RequirementDraft = { ...REQUIREMENT_PRESETS[3].values };

export const EXAMPLE_DESIGN: DesignDraft = {
  bus: { nominalVoltage: 565, maxVoltage: 622 },
  capacitors: { capacitance: 3.3e-6, series: 1, parallel: 2, toleranceMinus: 0.05, tolerancePlus: 0.05, ageing: null },
  bleeder: {
    resistance: 100e3,
    series: 2,
    parallel: 1,
    tolerance: 0.01,
    tcrPpmPerK: 100,
    drift: 0,
    powerRating: 3,
    elementVoltage: 500,
    derating: 0.5,
  },
  ambient: { min: -25, max: 85 },
  active: null,
  balancing: null,
};
