import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, radius, space, type } from '../constants/theme';
import { isInformational, type Check } from '../shared/schema/discharge';
import { formatPercent, formatQuantity } from '../shared/units';
import { Badge } from './ui/badge';

interface Props {
  check: Check;
  testID?: string;
}

/** Value against limit in the check's unit, e.g. "3.29 s against a limit of 5 s". */
// A dimensionless figure (a damping ratio) reads as a plain number, not with an SI prefix.
const show = (value: number, unit: string) => (unit ? formatQuantity(value, unit) : String(Number(value.toPrecision(3))));

function comparison(check: Check): string {
  if (check.value === null) return 'No value';
  const value = show(check.value, check.unit);
  if (check.band) {
    const where = check.value < check.band.lower ? 'below' : check.value > check.band.upper ? 'above' : 'within';
    return `${value} ${where} the band ${show(check.band.lower, check.unit)} – ${show(check.band.upper, check.unit)}`;
  }
  return check.limit === null ? value : `${value} against a limit of ${show(check.limit, check.unit)}`;
}

function marginText(check: Check): string | null {
  if (check.margin === null) return null;
  // Against a band the margin is to the nearer end (or past the end it falls beyond).
  if (check.band)
    return check.margin >= 0 ? `${formatPercent(check.margin, 2)} inside the nearer end` : `${formatPercent(-check.margin, 2)} beyond the band`;
  if (check.margin >= 0) return `${formatPercent(check.margin, 2)} margin`;
  // Far past the limit a ratio reads better than "over by 1300 %".
  return check.margin > -1 ? `misses the limit by ${formatPercent(-check.margin, 2)}` : `${Number((1 - check.margin).toPrecision(3))} × the limit`;
}

/** One check of the discharge result: what was compared, the outcome in words and a mark, and what decided it. */
export function CheckCard({ check, testID = `check-${check.id}` }: Props) {
  const informative = isInformational(check);
  const margin = marginText(check);
  return (
    <View
      testID={testID}
      style={[styles.card, !informative && !check.pass && styles.failed]}
      accessibilityLabel={`${check.label}: ${informative ? 'for information' : check.pass ? 'pass' : 'fail'}`}
    >
      <View style={styles.head}>
        <Text style={[type.heading, styles.label]}>{check.label}</Text>
        {informative ? (
          <Badge label="For information" tone="info" testID={`${testID}-status`} />
        ) : check.alternative ? (
          <Badge label={check.pass ? 'Criterion met' : 'Criterion not met'} tone={check.pass ? 'pass' : 'neutral'} testID={`${testID}-status`} />
        ) : (
          <Badge label={check.pass ? 'Pass' : 'Fail'} tone={check.pass ? 'pass' : 'fail'} testID={`${testID}-status`} />
        )}
      </View>
      <Text style={styles.value} testID={`${testID}-value`}>
        {comparison(check)}
        {margin ? <Text style={[styles.margin, check.margin !== null && check.margin < 0 && styles.marginNegative]}>{`  ·  ${margin}`}</Text> : null}
      </Text>
      <Text style={type.small} testID={`${testID}-detail`}>
        {check.detail}
      </Text>
      {check.alternative ? (
        <Text style={type.small}>An alternative criterion: it informs the discharge time and does not decide the verdict alone.</Text>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.xs, padding: space.md, borderRadius: radius.md, borderWidth: 1, borderColor: colors.line, backgroundColor: colors.surface },
  failed: { borderColor: colors.fail, borderLeftWidth: 4 },
  head: { flexDirection: 'row', justifyContent: 'space-between', alignItems: 'flex-start', gap: space.sm, flexWrap: 'wrap' },
  label: { flexShrink: 1 },
  value: { fontFamily: fonts.semibold, fontSize: 15, lineHeight: 21, color: colors.ink },
  margin: { fontFamily: fonts.regular, color: colors.inkMuted },
  marginNegative: { color: colors.fail, fontFamily: fonts.semibold },
});
