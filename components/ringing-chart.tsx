import { scaleLinear } from 'd3-scale';
import { line } from 'd3-shape';
import { useState } from 'react';
import { StyleSheet, Text, View, type LayoutChangeEvent } from 'react-native';
import Svg, { G, Line, Path, Text as SvgText } from 'react-native-svg';
import { LegendEntry } from './chart-legend';
import { colors, fonts, space, type } from '../constants/theme';
import { formatQuantity } from '../shared/units';

interface RingingPoint {
  t: number;
  v: number;
}

interface Props {
  /** Node voltage without the snubber, t in s. */
  before: readonly RingingPoint[];
  /** Node voltage with the snubber, on the same time axis. */
  after: readonly RingingPoint[];
  beforeLabel: string;
  afterLabel: string;
  /** Unit of v for the axis ticks ("V"), or "" when the curves are per volt of step. */
  unit: string;
  /** Axis title, e.g. "Node voltage (V)". */
  yTitle: string;
  /** Final value of the step, drawn as a thin reference line. */
  settled: number;
  /** What the plot shows, in words, for screen readers. */
  summary: string;
  testID: string;
  height?: number;
}

const PAD = { left: 52, right: 16, top: 10, bottom: 34 };
const BEFORE_DASH = '6 4';

const tickText = (value: number, unit: string) => (unit ? formatQuantity(value, unit, 3) : String(Number(value.toPrecision(3))));

/** Damped ringing of a switching node before and after a snubber: two traces told apart by dash and by name. */
export function RingingChart({ before, after, beforeLabel, afterLabel, unit, yTitle, settled, summary, testID, height = 220 }: Props) {
  const [width, setWidth] = useState(0);
  const onLayout = (e: LayoutChangeEvent) => setWidth(Math.round(e.nativeEvent.layout.width));

  const all = [...before, ...after];
  const tMax = Math.max(...all.map((p) => p.t));
  const vMin = Math.min(0, ...all.map((p) => p.v));
  const vMax = Math.max(settled, ...all.map((p) => p.v));
  const x = scaleLinear()
    .domain([0, tMax])
    .range([PAD.left, Math.max(PAD.left + 1, width - PAD.right)]);
  const y = scaleLinear()
    .domain([vMin, vMax])
    .nice(5)
    .range([height - PAD.bottom, PAD.top]);
  const path = line<RingingPoint>()
    .x((p) => x(p.t))
    .y((p) => y(p.v));
  // Fewer time ticks on a phone so labels like "150 ns" never touch.
  const xTicks = x.ticks(width < 480 ? 4 : 8);
  const yTicks = y.ticks(5);

  return (
    <View style={styles.wrap} testID={testID}>
      <View style={styles.legend}>
        <LegendEntry width={1.5} dash={BEFORE_DASH} stroke={colors.chartWorst} label={beforeLabel} testID={`${testID}-legend-before`} />
        <LegendEntry width={2.5} stroke={colors.chartNominal} label={afterLabel} testID={`${testID}-legend-after`} />
      </View>
      <Text style={type.small}>{yTitle}</Text>
      <View onLayout={onLayout} accessibilityRole="image" accessibilityLabel={summary}>
        {width > 0 ? (
          <Svg width={width} height={height}>
            <G>
              {yTicks.map((v) => (
                <G key={`y${v}`}>
                  <Line x1={PAD.left} x2={width - PAD.right} y1={y(v)} y2={y(v)} stroke={colors.line} strokeWidth={1} />
                  <SvgText x={PAD.left - 6} y={y(v) + 4} fontSize={11} fontFamily={fonts.regular} fill={colors.inkMuted} textAnchor="end">
                    {tickText(v, unit)}
                  </SvgText>
                </G>
              ))}
              {xTicks.map((t) => (
                <G key={`x${t}`}>
                  <Line x1={x(t)} x2={x(t)} y1={height - PAD.bottom} y2={height - PAD.bottom + 4} stroke={colors.chartLimit} strokeWidth={1} />
                  <SvgText
                    x={x(t)}
                    y={height - PAD.bottom + 16}
                    fontSize={11}
                    fontFamily={fonts.regular}
                    fill={colors.inkMuted}
                    textAnchor={x(t) > width - PAD.right - 24 ? 'end' : 'middle'}
                  >
                    {formatQuantity(t, 's', 3)}
                  </SvgText>
                </G>
              ))}
              <Line
                x1={PAD.left}
                x2={width - PAD.right}
                y1={height - PAD.bottom}
                y2={height - PAD.bottom}
                stroke={colors.chartLimit}
                strokeWidth={1}
              />
              <Line
                x1={PAD.left}
                x2={width - PAD.right}
                y1={y(settled)}
                y2={y(settled)}
                stroke={colors.chartLimit}
                strokeWidth={1}
                strokeDasharray="2 3"
              />
              <Path d={path([...before]) ?? ''} stroke={colors.chartWorst} strokeWidth={1.5} strokeDasharray={BEFORE_DASH} fill="none" />
              <Path d={path([...after]) ?? ''} stroke={colors.chartNominal} strokeWidth={2.5} fill="none" />
              <SvgText x={width - PAD.right} y={height - 4} fontSize={11} fontFamily={fonts.regular} fill={colors.inkMuted} textAnchor="end">
                time after the switching edge
              </SvgText>
            </G>
          </Svg>
        ) : (
          <View style={{ height }} />
        )}
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: space.sm },
  legend: { gap: space.xs },
});
