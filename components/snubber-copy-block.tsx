import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, radius, space, type } from '../constants/theme';
import type { RingingSizing } from '../shared/engine/snubber';
import type { RingingInputRaw } from '../shared/schema/snubber';
import { formatQuantity } from '../shared/units';
import { formatDampingRatio } from './snubber-sizing-results';
import { Button } from './ui/button';
import { Card } from './ui/card';

interface Props {
  sizing: RingingSizing;
  /** The input the sizing answers; its operating point names the dissipation line. */
  input: RingingInputRaw | null;
}

function copyText(sizing: RingingSizing, input: RingingInputRaw | null): string {
  const q = formatQuantity;
  const lines = [
    'Snubber sizing from ringing',
    `f0 = ${q(sizing.f0, 'Hz')}, C_add = ${q(sizing.cAdd, 'F')}, f1 = ${q(sizing.f1, 'Hz')}`,
    `C_par = ${q(sizing.cPar, 'F')}`,
    `L_par = ${q(sizing.lPar, 'H')}`,
    `R_snub = √(L_par/C_par) = ${q(sizing.resistance, 'Ω')}`,
    `  nearest E24: ${q(sizing.resistanceE24, 'Ω')}`,
    `C_snub = ${sizing.multiple} × C_par = ${q(sizing.capacitance, 'F')}`,
    `  nearest E12: ${q(sizing.capacitanceE12, 'F')}`,
    `Damping ratio, E24/E12 parts: ${formatDampingRatio(sizing.dampingRatio)}`,
  ];
  if (sizing.power !== null && sizing.powerE12 !== null && input?.switchingVoltage != null && input.switchingFrequency != null) {
    lines.push(
      `P_R = C·V²·f_sw at ${q(input.switchingVoltage, 'V')}, ${q(input.switchingFrequency, 'Hz')}`,
      `  = ${q(sizing.power, 'W')} (with ${q(sizing.capacitanceE12, 'F')}: ${q(sizing.powerE12, 'W')})`,
    );
  }
  return lines.join('\n');
}

export function SnubberCopyBlock({ sizing, input }: Props) {
  const text = copyText(sizing, input);
  const [copied, setCopied] = useState<'yes' | 'blocked' | null>(null);
  const copy = () => {
    const clipboard = typeof navigator === 'undefined' ? undefined : navigator.clipboard;
    if (!clipboard) {
      setCopied('blocked');
      return;
    }
    clipboard.writeText(text).then(
      () => setCopied('yes'),
      () => setCopied('blocked'),
    );
  };
  return (
    <Card title="Values to copy" testID="sizing-copy">
      <Text selectable style={styles.copyText} testID="sizing-copy-text">
        {text}
      </Text>
      <View style={styles.copyActions}>
        <Button label="Copy" variant="secondary" testID="sizing-copy-button" onPress={copy} />
        {copied === 'yes' ? (
          <Text style={type.small} testID="sizing-copied">
            ✓ Copied
          </Text>
        ) : null}
        {copied === 'blocked' ? (
          <Text style={type.small} testID="sizing-copy-blocked">
            This browser blocked copying; select the text above and copy it.
          </Text>
        ) : null}
      </View>
    </Card>
  );
}

const styles = StyleSheet.create({
  copyText: { ...type.mono, backgroundColor: colors.paper, padding: space.md, borderRadius: radius.md },
  copyActions: { flexDirection: 'row', alignItems: 'center', gap: space.md, flexWrap: 'wrap' },
});
