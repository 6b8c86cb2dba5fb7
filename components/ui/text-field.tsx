import { forwardRef, type ReactNode } from 'react';
import { StyleSheet, Text, TextInput, View, type TextInputProps } from 'react-native';
import { colors, fonts, radius, space, type } from '../../constants/theme';
import { ReadOnlyValue } from './read-only-value';

interface Props extends Omit<TextInputProps, 'style'> {
  label: string;
  testID: string;
  error?: string;
  hint?: string;
  /** Shown beside the entry (wrapping below it when the row is too narrow), e.g. how a quantity was read. */
  aside?: ReactNode;
}

/** A labelled text input; with `editable={false}` (a frozen record) the value is shown as text instead. */
export const TextField = forwardRef<TextInput, Props>(function TextField({ label, error, hint, aside, testID, ...input }, ref) {
  if (input.editable === false) return <ReadOnlyValue label={label} value={input.value ?? ''} testID={testID} />;
  const field = (
    <TextInput
      ref={ref}
      testID={testID}
      accessibilityLabel={label}
      aria-invalid={Boolean(error)}
      placeholderTextColor={colors.inkFaint}
      style={[styles.input, aside ? styles.inputBeside : null, error ? styles.inputError : null, input.multiline ? styles.multiline : null]}
      {...input}
    />
  );
  return (
    <View style={styles.wrap}>
      <Text style={type.label} nativeID={`${testID}-label`}>
        {label}
      </Text>
      {aside ? (
        <View style={styles.row}>
          {field}
          {aside}
        </View>
      ) : (
        field
      )}
      {error ? (
        <Text testID={`${testID}-error`} style={styles.error} accessibilityRole="alert">
          ✕ {error}
        </Text>
      ) : hint ? (
        <Text style={type.small}>{hint}</Text>
      ) : null}
    </View>
  );
});

const styles = StyleSheet.create({
  // Grows into the room it is given and shrinks to it: neither the input's own width nor a long error
  // message may push it past its card.
  wrap: { gap: space.xs, flexGrow: 1, flexShrink: 1, minWidth: 140, maxWidth: '100%' },
  input: {
    minHeight: 44,
    minWidth: 0,
    borderWidth: 1,
    borderColor: colors.line,
    borderRadius: radius.md,
    paddingHorizontal: space.md,
    backgroundColor: colors.surface,
    fontFamily: fonts.regular,
    fontSize: 16,
    color: colors.ink,
  },
  row: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', columnGap: space.sm, rowGap: space.xs },
  // Beside a reading the entry takes the room left, but never less than a short value needs.
  inputBeside: { flexGrow: 1, flexShrink: 1, flexBasis: 110, minWidth: 0 },
  multiline: { minHeight: 120, paddingVertical: space.sm, textAlignVertical: 'top' },
  inputError: { borderColor: colors.fail, borderWidth: 2 },
  error: { fontFamily: fonts.medium, fontSize: 13, color: colors.fail },
});
