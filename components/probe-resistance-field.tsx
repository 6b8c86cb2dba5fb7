import { StyleSheet, Text, View } from 'react-native';
import { space, type } from '../constants/theme';
import type { FieldKind } from '../shared/schema/fields';
import { Button } from './ui/button';
import { QuantityField } from './ui/quantity-field';

const OHMS: FieldKind = { type: 'quantity', unit: 'Ω' };

// Input resistance of common measuring inputs (docs/DOMAIN.md §5.3, from memory): offered, never assumed.
const PRESETS = [
  { id: '10M', value: 10e6, label: '10 MΩ — ×10 probe, typical — verify' },
  { id: '1M', value: 1e6, label: '1 MΩ — ×1 input, typical — verify' },
] as const;

export interface ProbeEntry {
  /** Ω, null when empty or not understood. */
  value: number | null;
  /** Text is there but cannot be read: the upload waits for it to be fixed. */
  invalid: boolean;
}

/** The measuring chain's input resistance across the capacitor, so the measured τ can be corrected for it. */
export function ProbeResistanceField({ entry, onChange }: { entry: ProbeEntry; onChange: (entry: ProbeEntry) => void }) {
  return (
    <View style={styles.wrap} testID="capture-probe">
      <QuantityField
        label="Instrument input resistance across the capacitor (optional)"
        kind={OHMS}
        value={entry.value}
        onChange={(value, state) => onChange({ value, invalid: state === 'bad' })}
        testID="capture-probe-resistance"
        placeholder="not corrected"
      />
      <View style={styles.presets}>
        {PRESETS.map((p) => (
          <Button
            key={p.id}
            label={p.label}
            variant="secondary"
            testID={`capture-probe-preset-${p.id}`}
            onPress={() => onChange({ value: p.value, invalid: false })}
          />
        ))}
      </View>
      <Text style={type.small}>
        The measured time constant is corrected for it (C at its lower tolerance). Left empty, the checks say that instrument loading was not
        corrected.
      </Text>
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: space.sm, flexBasis: '100%' },
  presets: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
});
