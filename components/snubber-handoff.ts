import type { RingingSizing } from '../shared/engine/snubber';
import type { RingingInputRaw } from '../shared/schema/snubber';
import type { SnubberDraft } from '../shared/schema/snubber';

// A snubber sized on the sizing screen, on its way to one draft's snubber list. The draft's Design tab
// takes it when it opens, adds it to the list and saves it through its own save, so the draft's usual
// checks (author, draft only, the version it was read at) apply to it like to anything typed there.
const waiting = new Map<number, SnubberDraft>();

/** The sized parts and the loop they were sized for; ratings, tolerance and location are the user's to enter. */
export function snubberFromSizing(sizing: RingingSizing, input: RingingInputRaw | null): SnubberDraft {
  return {
    kind: 'rc',
    location: '',
    accessible: false,
    resistance: sizing.resistanceE24,
    capacitance: sizing.capacitanceE12,
    parasiticInductance: sizing.lPar,
    parasiticCapacitance: sizing.cPar,
    switchingVoltage: input?.switchingVoltage ?? null,
    switchingFrequency: input?.switchingFrequency ?? null,
  };
}

export function handSnubberTo(revisionId: number, snubber: SnubberDraft): void {
  waiting.set(revisionId, snubber);
}

/** The snubber waiting for this revision, if any; it stays waiting until `dropHandedSnubber`. */
export function peekHandedSnubber(revisionId: number): SnubberDraft | undefined {
  return waiting.get(revisionId);
}

export function dropHandedSnubber(revisionId: number): void {
  waiting.delete(revisionId);
}
