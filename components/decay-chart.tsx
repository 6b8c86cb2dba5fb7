import { scaleLinear } from 'd3-scale';
import { line } from 'd3-shape';
import { useState } from 'react';
import { StyleSheet, Text, View, type LayoutChangeEvent } from 'react-native';
import Svg, { Circle, G, Line, Path, Text as SvgText } from 'react-native-svg';
import { LegendEntry } from './chart-legend';
import { colors, fonts, measuredPalette, space, type } from '../constants/theme';
import type { CurvePoint } from '../shared/schema/discharge';
import { formatQuantity } from '../shared/units';

export interface TracePoint {
  /** Seconds after disconnection. */
  t: number;
  /** Volts. */
  v: number;
}

export interface MeasuredTrace {
  name: string;
  trace: readonly TracePoint[];
}

interface Props {
  curve: readonly CurvePoint[];
  /** Only the two limits drawn; a draft requirement is fine, missing limits are left out. */
  requirement: { safeVoltage?: number | null; maxTime?: number | null };
  measured?: readonly MeasuredTrace[];
  testID?: string;
  height?: number;
}

const PAD = { left: 48, right: 16, top: 22, bottom: 40 };
const WORST_DASH = '8 4';
const LIMIT_DASH = '4 4';
// The first measurement is drawn solid and thick so it stands out over the predicted curves.
const MEASURED_DASHES: Array<string | undefined> = [undefined, '6 3', '1 4'];

/** Colour and dash of the i-th capture, the same in the legend and on the plot. */
const measuredStroke = (i: number) => ({ stroke: measuredPalette[i % measuredPalette.length], dash: MEASURED_DASHES[i % MEASURED_DASHES.length] });

interface Axis {
  unit: 'ms' | 's';
  factor: number;
}

/** Milliseconds when the whole plot is shorter than a second, so ticks read "250", not "0.25". */
function timeAxis(end: number): Axis {
  return end < 1 ? { unit: 'ms', factor: 1e3 } : { unit: 's', factor: 1 };
}

const tick = (value: number) => String(Number(value.toPrecision(4)));

/** First instant a series reaches `level`, interpolated between points. */
function crossing(points: readonly TracePoint[], level: number): number | null {
  for (let i = 0; i < points.length; i += 1) {
    const p = points[i];
    if (p.v <= level) {
      if (i === 0) return p.t;
      const a = points[i - 1];
      return a.t + ((a.v - level) / (a.v - p.v)) * (p.t - a.t);
    }
  }
  return null;
}

/** Keeps the lowest and highest sample of every pixel column, in time order: the shape of a long record survives. */
function decimate(trace: readonly TracePoint[], t0: number, t1: number, columns: number): TracePoint[] {
  const inside = trace.filter((p) => p.t >= t0 && p.t <= t1 && Number.isFinite(p.v));
  if (inside.length <= 2 * columns) return inside;
  const buckets = new Map<number, { lo: TracePoint; hi: TracePoint }>();
  for (const p of inside) {
    const k = Math.min(columns - 1, Math.floor(((p.t - t0) / (t1 - t0)) * columns));
    const b = buckets.get(k);
    if (!b) buckets.set(k, { lo: p, hi: p });
    else {
      if (p.v < b.lo.v) b.lo = p;
      if (p.v > b.hi.v) b.hi = p;
    }
  }
  return [...buckets.keys()]
    .sort((a, b) => a - b)
    .flatMap((k) => {
      const { lo, hi } = buckets.get(k)!;
      return lo === hi ? [lo] : lo.t < hi.t ? [lo, hi] : [hi, lo];
    });
}

/**
 * Bus voltage against time after disconnection: nominal and worst-case curves told apart by dash and
 * by name, the safe voltage and the time limit drawn and labelled, measured traces over them.
 */
export function DecayChart({ curve, requirement, measured = [], testID = 'decay-chart', height = 260 }: Props) {
  const [width, setWidth] = useState(0);
  const onLayout = (e: LayoutChangeEvent) => setWidth(Math.round(e.nativeEvent.layout.width));

  const safe = requirement.safeVoltage ?? null;
  const limit = requirement.maxTime ?? null;
  const nominal = curve.map((p) => ({ t: p.t, v: p.v }));
  const worst = curve.map((p) => ({ t: p.t, v: p.vWorst }));
  const end = curve.length > 0 ? curve[curve.length - 1].t : Math.max(limit ?? 0, ...measured.flatMap((m) => m.trace.map((p) => p.t)));
  if (!(end > 0)) return null;

  const axis = timeAxis(end);
  const plotWidth = Math.max(1, width - PAD.left - PAD.right);
  const traces = measured.map((m) => ({ name: m.name, points: decimate(m.trace, 0, end, plotWidth) }));
  const vTop = Math.max(safe ?? 0, ...curve.map((p) => Math.max(p.v, p.vWorst)), ...traces.flatMap((m) => m.points.map((p) => p.v)));
  const x = scaleLinear()
    .domain([0, end * axis.factor])
    .range([PAD.left, PAD.left + plotWidth]);
  const y = scaleLinear()
    .domain([0, vTop])
    .nice(5)
    .range([height - PAD.bottom, PAD.top]);
  const X = (t: number) => x(t * axis.factor);
  const path = line<TracePoint>()
    .x((p) => X(p.t))
    .y((p) => y(p.v));
  const xTicks = x.ticks(width < 480 ? 4 : 8);
  const yTicks = y.ticks(5);
  const right = PAD.left + plotWidth;

  const tNominal = safe === null ? null : crossing(nominal, safe);
  const tWorst = safe === null ? null : crossing(worst, safe);
  const summary = [
    safe !== null && tWorst !== null ? `Worst case reaches ${formatQuantity(safe, 'V')} at ${formatQuantity(tWorst, 's')}` : null,
    safe !== null && tNominal !== null ? `nominal at ${formatQuantity(tNominal, 's')}` : null,
    limit !== null ? `time limit ${formatQuantity(limit, 's')}` : null,
  ]
    .filter(Boolean)
    .join('; ');
  // The limit's label sits right of its line unless that would run off the plot.
  const limitX = limit !== null ? X(limit) : null;
  const limitLabelLeft = limitX !== null && limitX > right - 90;

  return (
    <View style={styles.wrap} testID={testID}>
      <View style={styles.legend}>
        {curve.length > 0 ? (
          <LegendEntry stroke={colors.chartNominal} width={2.5} label="Nominal (nominal parts, nominal bus)" testID={`${testID}-legend-nominal`} />
        ) : null}
        {curve.length > 0 ? (
          <LegendEntry
            stroke={colors.chartWorst}
            width={2}
            dash={WORST_DASH}
            label="Worst case (slowest parts, maximum bus)"
            testID={`${testID}-legend-worst`}
          />
        ) : null}
        {traces.map((m, i) => (
          <LegendEntry
            key={`${i}-${m.name}`}
            stroke={measuredStroke(i).stroke}
            width={3}
            dash={measuredStroke(i).dash}
            label={`Measured: ${m.name}`}
            testID={`${testID}-legend-measured-${i}`}
          />
        ))}
      </View>
      <Text style={type.small}>Bus voltage (V)</Text>
      <View onLayout={onLayout} accessibilityRole="image" accessibilityLabel={summary || 'Discharge curve'}>
        {width > 0 ? (
          <Svg width={width} height={height}>
            {yTicks.map((v) => (
              <G key={`y${v}`}>
                <Line x1={PAD.left} x2={right} y1={y(v)} y2={y(v)} stroke={colors.line} strokeWidth={1} />
                <SvgText x={PAD.left - 6} y={y(v) + 4} fontSize={11} fontFamily={fonts.regular} fill={colors.inkMuted} textAnchor="end">
                  {tick(v)}
                </SvgText>
              </G>
            ))}
            {xTicks.map((t) => (
              <G key={`x${t}`}>
                <Line x1={x(t)} x2={x(t)} y1={height - PAD.bottom} y2={height - PAD.bottom + 4} stroke={colors.chartLimit} strokeWidth={1} />
                <SvgText x={x(t)} y={height - PAD.bottom + 16} fontSize={11} fontFamily={fonts.regular} fill={colors.inkMuted} textAnchor="middle">
                  {tick(t)}
                </SvgText>
              </G>
            ))}
            <Line x1={PAD.left} x2={right} y1={height - PAD.bottom} y2={height - PAD.bottom} stroke={colors.chartLimit} strokeWidth={1} />
            <Line x1={PAD.left} x2={PAD.left} y1={PAD.top} y2={height - PAD.bottom} stroke={colors.chartLimit} strokeWidth={1} />
            <SvgText x={right} y={height - 4} fontSize={11} fontFamily={fonts.medium} fill={colors.inkMuted} textAnchor="end">
              {`Time after disconnection (${axis.unit})`}
            </SvgText>

            {safe !== null ? (
              <G testID={`${testID}-safe-line`}>
                <Line x1={PAD.left} x2={right} y1={y(safe)} y2={y(safe)} stroke={colors.chartLimit} strokeWidth={1.5} strokeDasharray={LIMIT_DASH} />
                <SvgText x={right - 4} y={y(safe) - 5} fontSize={11} fontFamily={fonts.semibold} fill={colors.ink} textAnchor="end">
                  {`Safe voltage ${formatQuantity(safe, 'V')}`}
                </SvgText>
              </G>
            ) : null}
            {limitX !== null && limit !== null && limit <= end ? (
              <G testID={`${testID}-limit-line`}>
                <Line
                  x1={limitX}
                  x2={limitX}
                  y1={PAD.top}
                  y2={height - PAD.bottom}
                  stroke={colors.chartLimit}
                  strokeWidth={1.5}
                  strokeDasharray={LIMIT_DASH}
                />
                <SvgText
                  x={limitLabelLeft ? limitX - 4 : limitX + 4}
                  y={PAD.top - 8}
                  fontSize={11}
                  fontFamily={fonts.semibold}
                  fill={colors.ink}
                  textAnchor={limitLabelLeft ? 'end' : 'start'}
                >
                  {`Time limit ${formatQuantity(limit, 's')}`}
                </SvgText>
              </G>
            ) : null}

            {curve.length > 0 ? (
              <>
                <Path d={path(nominal) ?? ''} stroke={colors.chartNominal} strokeWidth={2.5} fill="none" />
                <Path d={path(worst) ?? ''} stroke={colors.chartWorst} strokeWidth={2} strokeDasharray={WORST_DASH} fill="none" />
              </>
            ) : null}
            {traces.map((m, i) => (
              <Path
                key={`${i}-${m.name}`}
                d={path(m.points) ?? ''}
                stroke={measuredStroke(i).stroke}
                strokeWidth={3}
                strokeOpacity={0.85}
                strokeDasharray={measuredStroke(i).dash}
                fill="none"
                testID={`${testID}-measured-${i}`}
              />
            ))}
            {safe !== null && tNominal !== null ? (
              <Circle cx={X(tNominal)} cy={y(safe)} r={4} fill={colors.surface} stroke={colors.chartNominal} strokeWidth={2} />
            ) : null}
            {safe !== null && tWorst !== null ? (
              <Circle cx={X(tWorst)} cy={y(safe)} r={4} fill={colors.chartWorst} stroke={colors.chartWorst} strokeWidth={2} />
            ) : null}
          </Svg>
        ) : (
          <View style={{ height }} />
        )}
      </View>
      {summary ? (
        <Text style={type.small} testID={`${testID}-summary`}>
          {summary}.
        </Text>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: space.sm },
  legend: { gap: space.xs },
});
