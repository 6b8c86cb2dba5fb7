import { useEffect, useMemo, useState } from 'react';
import { StyleSheet, Text, useWindowDimensions, View } from 'react-native';
import { SnubberCopyBlock } from '../../components/snubber-copy-block';
import { SnubberRingingCard } from '../../components/snubber-ringing-card';
import { SnubberSizingProblem, type SizedReading } from '../../components/snubber-sizing-problem';
import { SnubberSizingResults } from '../../components/snubber-sizing-results';
import { SnubberToRevision } from '../../components/snubber-to-revision';
import { Card } from '../../components/ui/card';
import { Screen } from '../../components/ui/screen';
import {
  EMPTY,
  MEASUREMENT,
  OPERATING,
  readForm,
  serverFieldErrors,
  textsOf,
  type FieldName,
  type FieldSpec,
  type Texts,
} from '../../components/snubber-sizing-form';
import { TextField } from '../../components/ui/text-field';
import { space, type, WIDE_BREAKPOINT } from '../../constants/theme';
import { useMe } from '../../hooks/use-me';
import { useSnubberSizing } from '../../hooks/use-snubber-sizing';
import { formatQuantity, parseQuantity } from '../../shared/units';

export default function SnubberSizingScreen() {
  const { width } = useWindowDimensions();
  const wide = width >= WIDE_BREAKPOINT;
  const [texts, setTexts] = useState<Texts>(EMPTY);
  const form = useMemo(() => readForm(texts), [texts]);
  const { sizing, error, working } = useSnubberSizing(form.input);
  const fromServer = serverFieldErrors(error);
  const fieldError = (name: FieldName) => form.errors[name] ?? fromServer[name];
  const me = useMe().data;
  const mayDesign = me?.role === 'engineer' || me?.role === 'admin';
  // The last reading the server sized, so a mistyped value leaves something to go back to.
  const [lastSized, setLastSized] = useState<SizedReading | null>(null);
  useEffect(() => {
    if (sizing && !error && !working && form.input) setLastSized({ input: form.input, sizing });
  }, [sizing, error, working, form.input]);

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
          Read the ring frequency of the switching node, add a known capacitor across it, and read the lower frequency. Values take SI prefixes: “20
          MHz”, “300p”, “1.5 nF”.
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
        {halfOperatingPoint ? (
          <Text style={type.small} testID="sizing-operating-half">
            Enter both the voltage and the frequency for a dissipation figure.
          </Text>
        ) : null}
      </Card>
    </View>
  );

  // Reasons per field, from the form's own reading first, then from the server.
  const reasons = Object.values({ ...fromServer, ...form.errors }).filter((r): r is string => Boolean(r));
  const refused = error !== null || Object.keys(form.errors).length > 0;
  const sized = sizing && !error ? sizing : null;
  const results = (
    <View style={[styles.column, wide && styles.columnWide]}>
      <Card title="Parasitics and suggested snubber" testID="sizing-results" right={working ? <Text style={type.small}>Working…</Text> : null}>
        {refused ? (
          <SnubberSizingProblem
            message={error?.message ?? 'Some readings could not be read.'}
            reasons={reasons}
            lastSized={lastSized}
            onRestore={(input) => setTexts(textsOf(input))}
          />
        ) : sized ? (
          <SnubberSizingResults sizing={sized} />
        ) : (
          <Text style={type.body} testID="sizing-empty">
            Enter f0, C_add and f1 to see the parasitic L and C and a snubber that damps them.
          </Text>
        )}
      </Card>
      {sized ? <SnubberRingingCard sizing={sized} voltage={form.input?.switchingVoltage ?? null} /> : null}
      {sized && mayDesign ? <SnubberToRevision sizing={sized} input={form.input} /> : null}
      {sized ? <SnubberCopyBlock sizing={sized} input={form.input} /> : null}
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

const styles = StyleSheet.create({
  narrow: { gap: space.lg },
  wide: { flexDirection: 'row', gap: space.lg, alignItems: 'flex-start' },
  column: { gap: space.lg },
  columnWide: { flex: 1, minWidth: 0 },
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
});
