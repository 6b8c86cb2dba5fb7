import { EXAMPLE_DESIGN } from '../../constants/presets';

// Invented demo inputs for workflow tests (they exercise the workflow, not the engine's numbers).
export const demoRequirement = {
  safeVoltage: 60,
  maxTime: 5,
  maxEnergy: null,
  condition: 'after mains disconnection, cover removable without tool',
  reference: 'user clause text (demo)',
};

// A film-capacitor link that meets 60 V in 5 s with two 100 kΩ bleeders (worst case about 3.3 s): the
// Quick check's opening example, without the optional groups.
const { ageing: _ageing, ...exampleCapacitors } = EXAMPLE_DESIGN.capacitors!;
const { balancing: _balancing, ...exampleDesign } = EXAMPLE_DESIGN;
export const demoDesign = { ...exampleDesign, capacitors: exampleCapacitors, bleeder: EXAMPLE_DESIGN.bleeder!, active: null };

/** The same link with 1 kΩ bleeders: fast, but far over the resistors' power rating. */
export const failingDesign = { ...demoDesign, bleeder: { ...demoDesign.bleeder, resistance: 1_000 } };

/** A message waiting in `mail_queue`, due at `atIso`: what the mail sender picks up. */
export function pendingMailRow(subject: string, atIso: string) {
  return {
    to: 'reviewer@fennel.test',
    subject,
    text: 'body',
    html: '<p>body</p>',
    status: 'pending',
    attempts: 0,
    next_attempt_at: atIso,
    created_at: atIso,
  };
}
