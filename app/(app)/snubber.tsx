import { useMemo, useState } from 'react';
import { StyleSheet, Text, useWindowDimensions, View } from 'react-native';
import { RingingChart } from '../../components/ringing-chart';
import { Button } from '../../components/ui/button';
import { Card } from '../../components/ui/card';
import { Message } from '../../components/ui/message';
import { Screen } from '../../components/ui/screen';
import { TextField } from '../../components/ui/text-field';
import { colors, fonts, radius, space, type, WIDE_BREAKPOINT } from '../../constants/theme';
import { ApiError } from '../../hooks/api';
import { useSnubberSizing } from '../../hooks/use-snubber-sizing';
import { DEFAULT_MIN_DAMPING_RATIO, ringingCurves, type RingingSizing } from '../../shared/engine/snubber';
import { MULTIPLE_RANGE, type RingingInputRaw } from '../../shared/schema/snubber';
import { formatPercent, formatQuantity, parseQuantity, type ParseResult, type QuantityUnit } from '../../shared/units';

type FieldName = 'f0' | 'cAdd' | 'f1' | 'multiple' | 'switchingVoltage' | 'switchingFrequency';
type Texts = Record<FieldName, string>;

interface FieldSpec {
  name: FieldName;
  label: string;
  placeholder: string;
  hint?: string;
  unit?: QuantityUnit;
}

const MEASUREMENT: FieldSpec[] = [
  { name: 'f0', label: 'Ring frequency f0 (bare node)', placeholder: '20 MHz', unit: 'Hz' },
  { name: 'cAdd', label: 'Added capacitance C_add', placeholder: '300 pF', unit: 'F' },
  { name: 'f1', label: 'Ring frequency f1 (with C_add)', placeholder: '10 MHz', unit: 'Hz' },
  {
    name: 'multiple',
    label: 'Snubber C as a multiple of C_par',
    placeholder: String(MULTIPLE_RANGE.default),
    hint: 'Common practice 3–4×',
  },
];

const OPERATING: FieldSpec[] = [
  { name: 'switchingVoltage', label: 'Switching voltage (optional)', placeholder: '48 V', unit: 'V' },
  { name: 'switchingFrequency', label: 'Switching frequency (optional)', placeholder: '250 kHz', unit: 'Hz' },
];

const EMPTY: Texts = { f0: '', cAdd: '', f1: '', multiple: String(MULTIPLE_RANGE.default), switchingVoltage: '', switchingFrequency: '' };

function parseMultiple(text: string): ParseResult {
  const m = /^(\d+(?:[.,]\d+)?)\s*[×xX]?$/.exec(text.trim());
  return m ? { ok: true, value: Number(m[1].replace(',', '.')) } : { ok: false, error: `“${text.trim()}” is not a number — write e.g. “3.5”` };
}

/** Typed text → the API input; only the units are read here, the server judges ranges and f1 < f0. */
function readForm(texts: Texts): { input: RingingInputRaw | null; errors: Partial<Record<FieldName, string>> } {
  const errors: Partial<Record<FieldName, string>> = {};
  const values: Partial<Record<FieldName, number>> = {};
  for (const spec of [...MEASUREMENT, ...OPERATING]) {
    const text = texts[spec.name].trim();
    if (text === '') continue;
    const parsed = spec.unit ? parseQuantity(text, spec.unit) : parseMultiple(text);
    if (parsed.ok) values[spec.name] = parsed.value;
    else errors[spec.name] = parsed.error;
  }
  // An emptied multiple falls back to the default, as the server would.
  const { f0, cAdd, f1, multiple = MULTIPLE_RANGE.default, switchingVoltage = null, switchingFrequency = null } = values;
  if (f0 === undefined || cAdd === undefined || f1 === undefined || Object.keys(errors).length > 0) {
    return { input: null, errors };
  }
  return { input: { f0, cAdd, f1, multiple, switchingVoltage, switchingFrequency }, errors };
}

function serverFieldErrors(error: Error | null): Partial<Record<FieldName, string>> {
  if (!(error instanceof ApiError)) return {};
  return Object.fromEntries(error.fields.map((f) => [f.path, f.message]));
}

const ratio = (z: number) => z.toFixed(2);

export default function SnubberSizingScreen() {
  const { width } = useWindowDimensions();
  const wide = width >= WIDE_BREAKPOINT;
  const [texts, setTexts] = useState<Texts>(EMPTY);
  const form = useMemo(() => readForm(texts), [texts]);
  const { sizing, error, working } = useSnubberSizing(form.input);
  const fromServer = serverFieldErrors(error);
  const fieldError = (name: FieldName) => form.errors[name] ?? fromServer[name];

  const field = (spec: FieldSpec) => {
    const { unit } = spec;
    const parsed = unit && texts[spec.name].trim() !== '' ? parseQuantity(texts[spec.name], unit) : null;
    const shown = unit && parsed?.ok ? formatQuantity(parsed.value, unit, 4) : null;
    // Echo only a reading that differs from the typed form, where a slipped prefix would hide.
    const echo = shown !== null && shown !== texts[spec.name].trim() ? `Read as ${shown}` : undefined;
    return (
      <TextField
        key={spec.name}
        label={spec.label}
        testID={`sizing-${spec.name}`}
        placeholder={spec.placeholder}
        value={texts[spec.name]}
        onChangeText={(text) => setTexts((t) => ({ ...t, [spec.name]: text }))}
        autoCapitalize="none"
        autoCorrect={false}
        inputMode={spec.unit ? 'text' : 'decimal'}
        error={fieldError(spec.name)}
        hint={[spec.hint, echo].filter(Boolean).join(' · ') || undefined}
      />
    );
  };

  const halfOperatingPoint = (texts.switchingVoltage.trim() === '') !== (texts.switchingFrequency.trim() === '');
  const inputs = (
    <View style={[styles.column, wide && styles.columnWide]}>
      <Card title="Bench measurement">
        <Text style={type.small}>
          Read the ring frequency of the switching node, add a known capacitor across it, and read the lower frequency.
          Values take SI prefixes: “20 MHz”, “300p”, “1.5 nF”.
        </Text>
        {MEASUREMENT.map((spec) => (
          <View key={spec.name} style={styles.row}>
            {field(spec)}
          </View>
        ))}
      </Card>
      <Card title="Operating point">
        <Text style={type.small}>Give both to estimate the snubber resistor’s dissipation.</Text>
        <View style={styles.row}>{OPERATING.map(field)}</View>
        {halfOperatingPoint ? <Text style={type.small} testID="sizing-operating-half">Enter both the voltage and the frequency for a dissipation figure.</Text> : null}
      </Card>
    </View>
  );

  const errorText = !error
    ? null
    : error instanceof ApiError && error.fields.length > 0
      ? `${error.message} See the marked fields.`
      : error.message;
  const results = (
    <View style={[styles.column, wide && styles.columnWide]}>
      <Card title="Parasitics and suggested snubber" testID="sizing-results" right={working ? <Text style={type.small}>Working…</Text> : null}>
        {errorText ? <Message tone="error" text={errorText} testID="sizing-error" /> : null}
        {sizing && !error ? (
          <SizingTable sizing={sizing} />
        ) : !error ? (
          <Text style={type.body} testID="sizing-empty">
            Enter f0, C_add and f1 to see the parasitic L and C and a snubber that damps them.
          </Text>
        ) : null}
      </Card>
      {sizing && !error ? <RingingCard sizing={sizing} voltage={form.input?.switchingVoltage ?? null} /> : null}
      {sizing && !error ? <CopyBlock sizing={sizing} input={form.input} /> : null}
    </View>
  );

  return (
    <Screen title="Snubber sizing" subtitle="RC snubber from a measured ringing frequency" testID="snubber-screen" showCaution>
      <View style={wide ? styles.wide : styles.narrow}>
        {inputs}
        {results}
      </View>
    </Screen>
  );
}

function SizingTable({ sizing }: { sizing: RingingSizing }) {
  const parts = `${formatQuantity(sizing.resistanceE24, 'Ω')} + ${formatQuantity(sizing.capacitanceE12, 'F')}`;
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
      value: ratio(sizing.dampingRatio),
      note:
        (sizing.ringFrequency === null
          ? 'no ringing left'
          : `still rings at ${formatQuantity(sizing.ringFrequency, 'Hz')}, decaying`) +
        `; lossless loop assumed; a design's damping check asks at least ${DEFAULT_MIN_DAMPING_RATIO} (common practice)`,
    },
  ];
  if (sizing.power !== null && sizing.powerE12 !== null) {
    rows.push(
      { id: 'power', label: `Resistor dissipation C·V²·f_sw with ${formatQuantity(sizing.capacitance, 'F')}`, value: formatQuantity(sizing.power, 'W') },
      { id: 'power-e12', label: `Resistor dissipation with ${formatQuantity(sizing.capacitanceE12, 'F')}`, value: formatQuantity(sizing.powerE12, 'W') },
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
      {sizing.power === null ? <Text style={[type.small, styles.after]}>Add the switching voltage and frequency for the resistor dissipation.</Text> : null}
    </View>
  );
}

function RingingCard({ sizing, voltage }: { sizing: RingingSizing; voltage: number | null }) {
  const curves = useMemo(
    () =>
      ringingCurves({
        lPar: sizing.lPar,
        cPar: sizing.cPar,
        resistance: sizing.resistanceE24,
        capacitance: sizing.capacitanceE12,
        voltage: voltage ?? 1,
        periods: 6,
        points: 300,
      }),
    [sizing, voltage],
  );
  const parts = `${formatQuantity(sizing.resistanceE24, 'Ω')} + ${formatQuantity(sizing.capacitanceE12, 'F')}`;
  const after = curves.afterRinging;
  const summary =
    `Without the snubber the node overshoots by ${formatPercent(curves.beforeRinging.overshoot, 2)} and keeps ringing at ${formatQuantity(sizing.f0, 'Hz')}. ` +
    `With ${parts} it overshoots by ${formatPercent(after.overshoot, 2)}` +
    (after.decayTimeConstant === null ? '.' : ` and the ringing dies away with a time constant of ${formatQuantity(after.decayTimeConstant, 's')}.`);
  return (
    <Card title="Ringing before and after" testID="sizing-ringing">
      <RingingChart
        testID="ringing-chart"
        before={curves.before}
        after={curves.after}
        beforeLabel="Without snubber (dashed): lossless loop, rings on"
        afterLabel={`With the ${parts} snubber (solid)`}
        unit={voltage === null ? '' : 'V'}
        yTitle={voltage === null ? 'Node voltage per volt of step' : `Node voltage for a ${formatQuantity(voltage, 'V')} step (V)`}
        settled={voltage ?? 1}
        summary={summary}
      />
      <Text style={type.small} testID="ringing-summary">
        {summary}
      </Text>
    </Card>
  );
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
    `Damping ratio, E24/E12 parts: ${ratio(sizing.dampingRatio)}`,
  ];
  if (sizing.power !== null && sizing.powerE12 !== null && input?.switchingVoltage != null && input.switchingFrequency != null) {
    lines.push(
      `P_R = C·V²·f_sw at ${q(input.switchingVoltage, 'V')}, ${q(input.switchingFrequency, 'Hz')}`,
      `  = ${q(sizing.power, 'W')} (with ${q(sizing.capacitanceE12, 'F')}: ${q(sizing.powerE12, 'W')})`,
    );
  }
  return lines.join('\n');
}

function CopyBlock({ sizing, input }: { sizing: RingingSizing; input: RingingInputRaw | null }) {
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
        {copied === 'yes' ? <Text style={type.small} testID="sizing-copied">✓ Copied</Text> : null}
        {copied === 'blocked' ? <Text style={type.small} testID="sizing-copy-blocked">This browser blocked copying; select the text above and copy it.</Text> : null}
      </View>
    </Card>
  );
}

const styles = StyleSheet.create({
  narrow: { gap: space.lg },
  wide: { flexDirection: 'row', gap: space.lg, alignItems: 'flex-start' },
  column: { gap: space.lg },
  columnWide: { flex: 1, minWidth: 0 },
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
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
  copyText: { ...type.mono, backgroundColor: colors.paper, padding: space.md, borderRadius: radius.md },
  copyActions: { flexDirection: 'row', alignItems: 'center', gap: space.md, flexWrap: 'wrap' },
});
