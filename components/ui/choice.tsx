import { Pressable, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, radius, space, type } from '../../constants/theme';
import { ReadOnlyValue } from './read-only-value';

interface Props<T extends string> {
  label: string;
  testID: string;
  options: ReadonlyArray<{ value: T; label: string }>;
  value: T;
  onChange: (value: T) => void;
  disabled?: boolean;
  /** A frozen record: only the chosen option is shown, as text. */
  readOnly?: boolean;
}

/** A row of mutually exclusive options, large enough for a thumb. */
export function Choice<T extends string>({ label, testID, options, value, onChange, disabled, readOnly }: Props<T>) {
  if (readOnly) return <ReadOnlyValue label={label} value={options.find((o) => o.value === value)?.label ?? ''} testID={testID} />;
  return (
    <View style={styles.wrap} accessibilityRole="radiogroup" accessibilityLabel={label} testID={testID}>
      <Text style={type.label}>{label}</Text>
      <View style={styles.row}>
        {options.map((o) => {
          const selected = o.value === value;
          return (
            <Pressable
              key={o.value}
              testID={`${testID}-${o.value}`}
              accessibilityRole="radio"
              accessibilityState={{ checked: selected, disabled }}
              disabled={disabled}
              onPress={() => onChange(o.value)}
              style={[styles.option, selected && styles.selected, disabled && styles.disabled]}
            >
              <Text style={[styles.text, selected && styles.textSelected]}>
                {selected ? '● ' : '○ '}
                {o.label}
              </Text>
            </Pressable>
          );
        })}
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: space.xs },
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  option: {
    minHeight: 40,
    maxWidth: '100%',
    flexShrink: 1,
    paddingHorizontal: space.md,
    paddingVertical: space.xs,
    justifyContent: 'center',
    borderRadius: radius.md,
    borderWidth: 1,
    borderColor: colors.line,
    backgroundColor: colors.surface,
  },
  selected: { borderColor: colors.brand, backgroundColor: colors.brandSoft },
  disabled: { opacity: 0.6 },
  text: { fontFamily: fonts.medium, fontSize: 14, color: colors.inkMuted },
  textSelected: { color: colors.brand, fontFamily: fonts.semibold },
});
