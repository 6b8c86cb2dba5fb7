// The three-way merge behind "Keep my changes" when a draft was saved elsewhere: the stored design
// with this user's changes on top. Properties that must hold for any drafts (fast-check), plus the
// cases the conflict screen relies on.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { diffDesignInputs, mergeDesigns } from '../../shared/design-diff';
import type { DesignDraft } from '../../shared/schema/discharge';
import { demoDesign } from '../support/fixtures';

const base = demoDesign as DesignDraft;
const withBleeder = (d: DesignDraft, change: Record<string, unknown>) => ({ ...d, bleeder: { ...d.bleeder, ...change } }) as DesignDraft;

const number = fc.oneof(fc.constant(null), fc.double({ min: 1e-6, max: 1e6, noNaN: true }));
const draft = fc.record(
  {
    bus: fc.record({ nominalVoltage: number, maxVoltage: number }, { requiredKeys: [] }),
    bleeder: fc.record({ resistance: number, series: fc.integer({ min: 1, max: 8 }), powerRating: number }, { requiredKeys: [] }),
    ambient: fc.record({ min: number, max: number }, { requiredKeys: [] }),
    active: fc.constant(null),
    snubbers: fc.array(fc.record({ kind: fc.constant('rc' as const), name: fc.string({ minLength: 1, maxLength: 8 }), resistance: number }), {
      maxLength: 3,
    }),
  },
  { requiredKeys: [] },
) as fc.Arbitrary<DesignDraft>;

describe('merging a draft saved elsewhere', () => {
  it('when only this user changed inputs, then the merge is their design; when only the other side did, it is the stored one', () => {
    fc.assert(
      fc.property(draft, draft, (from, other) => {
        expect(diffDesignInputs(mergeDesigns(from, other, from), other)).toEqual([]);
        expect(diffDesignInputs(mergeDesigns(from, from, other), other)).toEqual([]);
      }),
    );
  });

  it('when both sides changed different inputs, then both changes are in the merge', () => {
    const mine = withBleeder(base, { powerRating: 5 });
    const stored = withBleeder(base, { resistance: 68_000 });
    const merged = mergeDesigns(base, mine, stored);
    expect(merged.bleeder).toMatchObject({ powerRating: 5, resistance: 68_000 });
    expect(diffDesignInputs(base, merged).map((c) => c.path)).toEqual(['bleeder.resistance', 'bleeder.powerRating']);
  });

  it("when both sides changed the same input, then this user's value is kept", () => {
    const merged = mergeDesigns(base, withBleeder(base, { resistance: 82_000 }), withBleeder(base, { resistance: 68_000 }));
    expect(merged.bleeder?.resistance).toBe(82_000);
  });

  it('when this user cleared an input, then it stays cleared; a snubber added elsewhere stays', () => {
    const mine = { ...base, ambient: { min: -25 } } as DesignDraft;
    const stored = { ...base, snubbers: [{ kind: 'rc', name: 'R12/C7', resistance: 82 }] } as DesignDraft;
    const merged = mergeDesigns(base, mine, stored);
    expect(merged.ambient).toEqual({ min: -25 });
    expect(merged.snubbers).toEqual([{ kind: 'rc', name: 'R12/C7', resistance: 82 }]);
  });
});
