import { Platform, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, radius, space, type } from '../constants/theme';
import { inputLabel } from '../shared/design-fields';
import { completeInput, spiceNetlist } from '../shared/engine';
import {
  isInformational,
  type BleederOption,
  type DesignDraft,
  type DischargeResult,
  type NetworkState,
  type RequirementDraft,
  type Suggestion,
} from '../shared/schema/discharge';
import { formatQuantity } from '../shared/units';
import { CautionLine } from './caution-line';
import { CheckCard } from './check-card';
import { DecayChart, type MeasuredTrace } from './decay-chart';
import { Button } from './ui/button';
import { Card } from './ui/card';

interface Props {
  result: DischargeResult;
  requirement: RequirementDraft;
  /** The design the result is for; when given and complete, the worst-case SPICE netlist can be downloaded. */
  design?: DesignDraft;
  measured?: readonly MeasuredTrace[];
  testIDPrefix?: string;
}

function verdictText(result: DischargeResult): { mark: string; words: string; tone: 'pass' | 'fail' | 'pending' } {
  if (result.verdict === 'incomplete') return { mark: '◷', words: 'Incomplete: no verdict yet', tone: 'pending' };
  const judged = result.checks.filter((c) => !c.alternative && !isInformational(c));
  const failed = result.checks.filter((c) => !c.alternative && !c.pass);
  if (result.verdict === 'meets') return { mark: '✓', words: `Meets every check (${judged.length} of ${judged.length})`, tone: 'pass' };
  return { mark: '✕', words: `Fails: ${failed.length} of ${judged.length} checks`, tone: 'fail' };
}

/**
 * One line with the verdict, for screens where the full panel may be scrolled out of sight while
 * the inputs are edited.
 */
export function VerdictStrip({ result, testID = 'verdict-strip' }: { result: DischargeResult; testID?: string }) {
  const verdict = verdictText(result);
  const firstFailure = result.checks.find((c) => !c.alternative && !c.pass);
  const more =
    result.verdict === 'incomplete'
      ? `${result.missing.length} input${result.missing.length === 1 ? '' : 's'} missing`
      : firstFailure && firstFailure.value !== null && firstFailure.limit !== null
        ? `${firstFailure.label}: ${formatQuantity(firstFailure.value, firstFailure.unit)} against ${formatQuantity(firstFailure.limit, firstFailure.unit)}`
        : null;
  return (
    <View
      style={[styles.strip, { backgroundColor: toneSoft[verdict.tone], borderColor: toneColour[verdict.tone] }]}
      testID={testID}
      accessibilityRole="summary"
    >
      <Text style={[styles.stripText, { color: toneColour[verdict.tone] }]} numberOfLines={2}>
        {verdict.mark} {verdict.words}
        {more ? <Text style={styles.stripMore}>{`  ·  ${more}`}</Text> : null}
      </Text>
    </View>
  );
}

/** Web only: hands the text to the browser as a file download. */
function downloadText(fileName: string, text: string) {
  const url = URL.createObjectURL(new Blob([text], { type: 'text/plain' }));
  const anchor = document.createElement('a');
  anchor.href = url;
  anchor.download = fileName;
  document.body.appendChild(anchor);
  anchor.click();
  anchor.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

/**
 * The discharge result (docs/DOMAIN.md §7.3): verdict in words and a mark, a card per check, the decay
 * chart, nominal against worst case, sensitivity, the bleeder suggestion, the netlist and the caution.
 */
export function ResultsPanel({ result, requirement, design, measured, testIDPrefix = 'results' }: Props) {
  const verdict = verdictText(result);
  const failed = result.checks.filter((c) => !c.alternative && !c.pass);
  const complete = design ? completeInput({ requirement, design }) : null;

  return (
    <View style={styles.wrap} testID={testIDPrefix}>
      <View
        style={[styles.verdict, { backgroundColor: toneSoft[verdict.tone], borderColor: toneColour[verdict.tone] }]}
        testID={`${testIDPrefix}-verdict`}
        accessibilityRole="summary"
      >
        <Text style={[styles.verdictText, { color: toneColour[verdict.tone] }]} testID={`${testIDPrefix}-verdict-text`}>
          {verdict.mark} {verdict.words}
        </Text>
        {result.verdict === 'fails' ? <Text style={type.body}>Failing: {failed.map((c) => c.label).join('; ')}.</Text> : null}
        {result.verdict === 'incomplete' ? (
          <View style={styles.missing} testID={`${testIDPrefix}-missing`}>
            <Text style={type.body}>Fill in these inputs for a verdict:</Text>
            {result.missing.map((path) => (
              <Text key={path} style={type.body}>
                • {inputLabel(path)}
              </Text>
            ))}
          </View>
        ) : null}
        <Text style={type.small}>Worst-case corners; limits as entered. Engine {result.engineVersion}.</Text>
      </View>

      {result.checks.length > 0 ? (
        <View style={styles.checks}>
          {result.checks.map((check) => (
            <CheckCard key={check.id} check={check} testID={`${testIDPrefix}-check-${check.id}`} />
          ))}
        </View>
      ) : null}

      {result.curve.length > 0 || (measured && measured.length > 0) ? (
        <Card title="Discharge curve" testID={`${testIDPrefix}-chart-card`}>
          <DecayChart curve={result.curve} requirement={requirement} measured={measured} testID={`${testIDPrefix}-chart`} />
        </Card>
      ) : null}

      {result.nominal && result.worstCase ? (
        <Card title="Nominal and worst case" testID={`${testIDPrefix}-corners`}>
          <CornerTable nominal={result.nominal} worst={result.worstCase} />
        </Card>
      ) : null}

      {result.sensitivity ? (
        <Card title="Sensitivity" testID={`${testIDPrefix}-sensitivity`}>
          <Text style={type.small}>Change of the {result.sensitivity.of} when one input is 1 % higher.</Text>
          {[...result.sensitivity.entries]
            .sort((a, b) => Math.abs(b.percentPerPercent) - Math.abs(a.percentPerPercent))
            .map((e) => (
              <View key={e.input} style={styles.row}>
                <Text style={[type.body, styles.rowLabel]}>{e.label}</Text>
                <Text style={styles.number}>{`${e.percentPerPercent >= 0 ? '+' : '−'}${Math.abs(e.percentPerPercent).toFixed(2)} %`}</Text>
              </View>
            ))}
        </Card>
      ) : null}

      {result.suggestion ? <SuggestionCard suggestion={result.suggestion} testID={`${testIDPrefix}-suggestion`} /> : null}

      {complete?.ok ? (
        <Card title="Re-check in a circuit simulator" testID={`${testIDPrefix}-netlist`}>
          <Text style={type.small}>
            The worst-case bleeder network, element by element, as a plain SPICE netlist: a transient run from the charged bank with a measurement of
            the time to the safe threshold.
          </Text>
          {Platform.OS === 'web' ? (
            <View style={styles.start}>
              <Button
                label="Download SPICE netlist"
                variant="secondary"
                testID="download-netlist"
                onPress={() =>
                  downloadText('discharge-worst-case.cir', spiceNetlist({ requirement: complete.requirement, design: complete.design }, 'worst'))
                }
              />
            </View>
          ) : (
            <Text selectable style={type.mono}>
              {spiceNetlist({ requirement: complete.requirement, design: complete.design }, 'worst')}
            </Text>
          )}
        </Card>
      ) : null}

      <CautionLine />
    </View>
  );
}

const toneColour = { pass: colors.pass, fail: colors.fail, pending: colors.pending } as const;
const toneSoft = { pass: colors.passSoft, fail: colors.failSoft, pending: colors.pendingSoft } as const;

function CornerTable({ nominal, worst }: { nominal: NetworkState; worst: NetworkState }) {
  const rows: Array<[string, (s: NetworkState) => string]> = [
    ['Resistance (network)', (s) => formatQuantity(s.resistance, 'Ω')],
    ['Capacitance (network)', (s) => formatQuantity(s.capacitance, 'F')],
    ['Initial voltage V0', (s) => formatQuantity(s.initialVoltage, 'V')],
    ['Time constant τ', (s) => formatQuantity(s.tau, 's')],
    ['Time to safe', (s) => formatQuantity(s.timeToSafe, 's')],
  ];
  if (nominal.passiveTimeToSafe !== nominal.timeToSafe || worst.passiveTimeToSafe !== worst.timeToSafe) {
    rows.push(['Time to safe, bleeders alone', (s) => formatQuantity(s.passiveTimeToSafe, 's')]);
  }
  return (
    <View accessibilityRole="list">
      <View style={[styles.tableRow, styles.tableHead]}>
        <Text style={[type.label, styles.tableLabel]}>Quantity</Text>
        <Text style={[type.label, styles.tableCell]}>Nominal</Text>
        <Text style={[type.label, styles.tableCell]}>Worst case</Text>
      </View>
      {rows.map(([label, show]) => (
        <View key={label} style={styles.tableRow}>
          <Text style={[type.body, styles.tableLabel]}>{label}</Text>
          <Text style={[styles.number, styles.tableCell]}>{show(nominal)}</Text>
          <Text style={[styles.number, styles.tableCell]}>{show(worst)}</Text>
        </View>
      ))}
    </View>
  );
}

/** "2 × 150 kΩ (E24) in series, 1 string" */
function arrangement(o: BleederOption): string {
  const strings = `${o.parallel} string${o.parallel > 1 ? 's' : ''}`;
  return `${o.series} × ${formatQuantity(o.resistance, 'Ω')} (${o.eSeries})${o.series > 1 ? ' in series' : ''}, ${strings}`;
}

function SuggestionCard({ suggestion, testID }: { suggestion: Suggestion; testID: string }) {
  return (
    <Card title="Largest standard bleeder meeting every limit" testID={testID}>
      {suggestion.found ? (
        <>
          <Text style={styles.suggestionHead}>{arrangement(suggestion)}</Text>
          <Text style={type.small} testID={`${testID}-detail`}>
            {suggestion.detail}
          </Text>
          {suggestion.alternatives.length > 0 ? (
            <View style={styles.alternatives}>
              <Text style={type.label}>Also meeting every limit:</Text>
              {suggestion.alternatives.map((a) => (
                <Text key={`${a.eSeries}-${a.series}-${a.parallel}-${a.resistance}`} style={type.small}>
                  {`• ${arrangement(a)}: worst case ${formatQuantity(a.worstCaseTime, 's')}, ${formatQuantity(a.powerPerResistor, 'W')} each`}
                </Text>
              ))}
            </View>
          ) : null}
        </>
      ) : (
        <Text style={type.body} testID={`${testID}-reason`}>
          No standard bleeder meets every limit. {suggestion.reason}
        </Text>
      )}
    </Card>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: space.md },
  verdict: { gap: space.xs, padding: space.lg, borderRadius: radius.lg, borderWidth: 1, borderLeftWidth: 6 },
  strip: { paddingVertical: space.sm, paddingHorizontal: space.md, borderRadius: radius.md, borderWidth: 1 },
  stripText: { fontFamily: fonts.bold, fontSize: 15, lineHeight: 20 },
  stripMore: { fontFamily: fonts.medium, color: colors.ink },
  verdictText: { fontFamily: fonts.bold, fontSize: 20, lineHeight: 26 },
  missing: { gap: 2 },
  checks: { gap: space.sm },
  row: { flexDirection: 'row', justifyContent: 'space-between', gap: space.md, paddingVertical: 2 },
  rowLabel: { flexShrink: 1 },
  number: { fontFamily: fonts.mono, fontSize: 13, lineHeight: 21, color: colors.ink, textAlign: 'right' },
  start: { alignSelf: 'flex-start' },
  tableRow: { flexDirection: 'row', gap: space.sm, paddingVertical: space.xs, borderTopWidth: 1, borderTopColor: colors.line },
  tableHead: { borderTopWidth: 0 },
  tableLabel: { flex: 1.4 },
  tableCell: { flex: 1, textAlign: 'right' },
  suggestionHead: { fontFamily: fonts.semibold, fontSize: 15, lineHeight: 21, color: colors.ink },
  alternatives: { gap: 2 },
});
