import { useEffect, useState } from 'react';
import { StyleSheet, Text } from 'react-native';
import { colors, fonts } from '../../constants/theme';
import { fieldText, formatField, parseField } from '../../shared/design-fields';
import type { FieldKind } from '../../shared/schema/fields';
import { formatPercent, formatQuantity } from '../../shared/units';
import { TextField } from './text-field';

interface Props {
  label: string;
  kind: FieldKind;
  /** SI value; null or undefined when empty or not understood. */
  value: number | null | undefined;
  /** Called with the SI value of valid text, null for empty or invalid text, and which of the three it is. */
  onChange: (value: number | null, state: Reading['state']) => void;
  testID: string;
  placeholder?: string;
  /** A problem found elsewhere (schema, server); shown when the text itself parses. */
  error?: string;
  readOnly?: boolean;
}

type Reading = { state: 'empty' } | { state: 'ok'; value: number } | { state: 'bad'; error: string };

function read(kind: FieldKind, text: string): Reading {
  if (text.trim() === '') return { state: 'empty' };
  const parsed = parseField(kind, text);
  return parsed.ok ? { state: 'ok', value: parsed.value } : { state: 'bad', error: parsed.error };
}

function same(a: number | null, b: number | null | undefined): boolean {
  if (a === null || b === null || b === undefined) return a === null && (b === null || b === undefined);
  return a === b || Math.abs(a - b) <= 1e-9 * Math.max(Math.abs(a), Math.abs(b));
}

/**
 * The value as editable text. The usual three-digit form is used when it reads back to the same
 * number; a value set from outside (a preset, the mains helper) that it would round gets more digits,
 * so what the field shows is what the calculation uses.
 */
function editableText(kind: FieldKind, value: number | null | undefined): string {
  const usual = fieldText(kind, value);
  if (value === null || value === undefined) return usual;
  const back = read(kind, usual);
  if (back.state === 'ok' && same(back.value, value)) return usual;
  switch (kind.type) {
    case 'quantity':
      return formatQuantity(value, kind.unit, 9);
    case 'percent':
      return formatPercent(value, 9);
    default:
      return String(value);
  }
}

/**
 * A text field for an engineer's quantity ("470u", "2k2", "1 %", "85 °C"). It keeps the text as typed,
 * reports the SI value, shows beside the entry how it read the text (always, while typing, so a slip
 * such as a missing prefix is seen before it counts), and says what is wrong with text it cannot read.
 */
export function QuantityField({ label, kind, value, onChange, testID, placeholder, error, readOnly }: Props) {
  const [text, setText] = useState(() => editableText(kind, value));
  const reading = read(kind, text);

  // A value changed from outside replaces the text unless the text already means that value.
  useEffect(() => {
    setText((current) => {
      const r = read(kind, current);
      return same(r.state === 'ok' ? r.value : null, value) ? current : editableText(kind, value);
    });
  }, [kind, value]);

  const change = (next: string) => {
    setText(next);
    const r = read(kind, next);
    onChange(r.state === 'ok' ? r.value : null, r.state);
  };

  // Always in place (empty until the text reads as a value), so the entry does not jump when it appears.
  const aside =
    kind.type === 'count' ? undefined : (
      <Text style={styles.reading} testID={`${testID}-reading`} accessibilityLiveRegion="polite">
        {reading.state === 'ok' ? `read as ${formatField(kind, reading.value)}` : ''}
      </Text>
    );

  return (
    <TextField
      label={label}
      testID={testID}
      value={text}
      onChangeText={change}
      placeholder={placeholder}
      editable={!readOnly}
      autoCapitalize="none"
      autoCorrect={false}
      spellCheck={false}
      inputMode={kind.type === 'count' ? 'numeric' : 'text'}
      error={reading.state === 'bad' ? reading.error : error}
      aside={aside}
    />
  );
}

const styles = StyleSheet.create({
  // A common width for short readings keeps the entries of a column aligned.
  reading: { flexShrink: 1, minWidth: 96, maxWidth: '100%', fontFamily: fonts.medium, fontSize: 13, lineHeight: 18, color: colors.inkMuted },
});
