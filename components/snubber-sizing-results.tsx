import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, space, type } from '../constants/theme';
import { DEFAULT_MIN_DAMPING_RATIO, type RingingSizing } from '../shared/engine/snubber';
import { formatQuantity } from '../shared/units';

/** The damping ratio as the table and the copy block both show it, so the two never disagree. */
export const formatDampingRatio = (z: number) => z.toFixed(2);

/** The rounded parts, "82 Ω + 330 pF", as every snubber card names them. */
export function snubberParts(sizing: RingingSizing): string {
  return `${formatQuantity(sizing.resistanceE24, 'Ω')} + ${formatQuantity(sizing.capacitanceE12, 'F')}`;
}

export function SnubberSizingResults({ sizing }: { sizing: RingingSizing }) {
  const parts = snubberParts(sizing);
  const rows: Array<{ id: string; label: string; value: string; note?: string }> = [
    { id: 'cpar', label: 'Parasitic capacitance C_par', value: formatQuantity(sizing.cPar, 'F') },
    { id: 'lpar', label: 'Parasitic inductance L_par', value: formatQuantity(sizing.lPar, 'H') },
    { id: 'r', label: 'Snubber R = √(L_par / C_par)', value: formatQuantity(sizing.resistance, 'Ω'), note: 'characteristic impedance of the loop' },
    { id: 'csnub', label: `Snubber C = ${sizing.multiple} × C_par`, value: formatQuantity(sizing.capacitance, 'F') },
    { id: 'r-e24', label: 'Nearest E24 resistor', value: formatQuantity(sizing.resistanceE24, 'Ω') },
    { id: 'c-e12', label: 'Nearest E12 capacitor', value: formatQuantity(sizing.capacitanceE12, 'F') },
    {
      id: 'damping',
      label: `Damping ratio with ${parts}`,
      value: formatDampingRatio(sizing.dampingRatio),
      note:
        (sizing.ringFrequency === null ? 'no ringing left' : `still rings at ${formatQuantity(sizing.ringFrequency, 'Hz')}, decaying`) +
        `; lossless loop assumed; a design's damping check asks at least ${DEFAULT_MIN_DAMPING_RATIO} (common practice)`,
    },
  ];
  if (sizing.power !== null && sizing.powerE12 !== null) {
    rows.push(
      {
        id: 'power',
        label: `Resistor dissipation C·V²·f_sw with ${formatQuantity(sizing.capacitance, 'F')}`,
        value: formatQuantity(sizing.power, 'W'),
      },
      {
        id: 'power-e12',
        label: `Resistor dissipation with ${formatQuantity(sizing.capacitanceE12, 'F')}`,
        value: formatQuantity(sizing.powerE12, 'W'),
      },
    );
  }
  return (
    <View>
      {rows.map((row) => (
        <View key={row.id} style={styles.resultRow} testID={`result-${row.id}`}>
          <View style={styles.resultLabel}>
            <Text style={type.body}>{row.label}</Text>
            {row.note ? <Text style={type.small}>{row.note}</Text> : null}
          </View>
          <Text style={styles.resultValue} testID={`result-${row.id}-value`}>
            {row.value}
          </Text>
        </View>
      ))}
      {sizing.power === null ? (
        <Text style={[type.small, styles.after]}>Add the switching voltage and frequency for the resistor dissipation.</Text>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  resultRow: {
    flexDirection: 'row',
    justifyContent: 'space-between',
    alignItems: 'center',
    gap: space.md,
    paddingVertical: space.sm,
    borderTopWidth: 1,
    borderTopColor: colors.line,
  },
  resultLabel: { flexShrink: 1, gap: 2 },
  resultValue: { fontFamily: fonts.semibold, fontSize: 16, color: colors.ink, textAlign: 'right', flexShrink: 0 },
  after: { paddingTop: space.sm },
});
