import { StyleSheet, Text, View } from 'react-native';
import Svg, { Line } from 'react-native-svg';
import { colors, space, type } from '../constants/theme';

/** One legend line of a chart: a sample of the stroke (dash included) and its name in words. */
export function LegendEntry({ label, stroke, width, dash, testID }: { label: string; stroke: string; width: number; dash?: string; testID: string }) {
  return (
    <View style={styles.entry} testID={testID}>
      <Svg width={36} height={10}>
        <Line x1={0} x2={36} y1={5} y2={5} stroke={stroke} strokeWidth={width} strokeDasharray={dash} />
      </Svg>
      <Text style={[type.small, styles.text]}>{label}</Text>
    </View>
  );
}

const styles = StyleSheet.create({
  entry: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  text: { color: colors.ink, flexShrink: 1 },
});
