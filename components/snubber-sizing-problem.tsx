import { StyleSheet, Text, View } from 'react-native';
import { colors, radius, space, type } from '../constants/theme';
import type { RingingSizing } from '../shared/engine/snubber';
import type { RingingInputRaw } from '../shared/schema/snubber';
import { formatQuantity } from '../shared/units';
import { snubberParts } from './snubber-sizing-results';
import { Button } from './ui/button';
import { Message } from './ui/message';

export interface SizedReading {
  input: RingingInputRaw;
  sizing: RingingSizing;
}

interface Props {
  /** What the server or the form said, in one sentence. */
  message: string;
  /** The reasons given per field, e.g. "f1 must be below f0: …". */
  reasons: string[];
  /** The last reading that could be sized, to go back to. */
  lastSized: SizedReading | null;
  onRestore: (input: RingingInputRaw) => void;
}

const reading = (input: RingingInputRaw) =>
  `f0 ${formatQuantity(input.f0, 'Hz')}, C_add ${formatQuantity(input.cAdd, 'F')}, f1 ${formatQuantity(input.f1, 'Hz')}`;

/**
 * Why the current reading gives no sizing, and the last reading that did: the column keeps saying what
 * to do instead of going blank. The old figures are named as such and never shown as the result.
 */
export function SnubberSizingProblem({ message, reasons, lastSized, onRestore }: Props) {
  return (
    <View style={styles.wrap} testID="sizing-problem">
      <Message tone="error" text={reasons.length ? `No sizing for this reading: ${reasons.join('; ')}.` : message} testID="sizing-error" />
      {lastSized ? (
        <View style={styles.last} testID="sizing-last">
          <Text style={type.label}>Last reading that could be sized (not the reading above)</Text>
          <Text style={type.body}>
            {reading(lastSized.input)} gave C_par {formatQuantity(lastSized.sizing.cPar, 'F')}, L_par {formatQuantity(lastSized.sizing.lPar, 'H')} and{' '}
            {snubberParts(lastSized.sizing)}.
          </Text>
          <View style={styles.start}>
            <Button label="Put that reading back" variant="secondary" testID="sizing-restore" onPress={() => onRestore(lastSized.input)} />
          </View>
        </View>
      ) : (
        <Text style={type.small}>f1 is read with the added capacitor, so it lies below f0; each value needs its unit or SI prefix.</Text>
      )}
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: space.md },
  last: {
    gap: space.xs,
    padding: space.md,
    borderRadius: radius.md,
    borderWidth: 1,
    borderStyle: 'dashed',
    borderColor: colors.line,
    backgroundColor: colors.paper,
  },
  start: { alignSelf: 'flex-start', paddingTop: space.xs },
});
