import { ActivityIndicator, Pressable, StyleSheet, Text } from 'react-native';
import { colors, fonts, radius, space } from '../../constants/theme';

type Variant = 'primary' | 'secondary' | 'danger' | 'quiet';

interface Props {
  label: string;
  onPress: () => void;
  testID: string;
  variant?: Variant;
  disabled?: boolean;
  busy?: boolean;
  accessibilityHint?: string;
}

export function Button({ label, onPress, testID, variant = 'primary', disabled, busy, accessibilityHint }: Props) {
  const inactive = disabled || busy;
  return (
    <Pressable
      testID={testID}
      accessibilityRole="button"
      accessibilityState={{ disabled: inactive, busy }}
      accessibilityHint={accessibilityHint}
      disabled={inactive}
      onPress={onPress}
      style={({ pressed }) => [styles.base, styles[variant], pressed && styles.pressed, inactive && styles.inactive]}
    >
      {busy ? <ActivityIndicator size="small" color={variant === 'primary' ? colors.surface : colors.brand} /> : null}
      <Text style={[styles.label, variant === 'primary' || variant === 'danger' ? styles.labelOnDark : styles.labelOnLight]}>{label}</Text>
    </Pressable>
  );
}

const styles = StyleSheet.create({
  base: {
    minHeight: 44,
    paddingHorizontal: space.lg,
    borderRadius: radius.md,
    alignItems: 'center',
    justifyContent: 'center',
    flexDirection: 'row',
    gap: space.sm,
    borderWidth: 1,
    // A long label wraps inside the button rather than pushing it past its card.
    maxWidth: '100%',
  },
  primary: { backgroundColor: colors.brand, borderColor: colors.brand },
  secondary: { backgroundColor: colors.surface, borderColor: colors.brand },
  danger: { backgroundColor: colors.fail, borderColor: colors.fail },
  quiet: { backgroundColor: 'transparent', borderColor: 'transparent' },
  pressed: { opacity: 0.85 },
  inactive: { opacity: 0.5 },
  label: { fontFamily: fonts.semibold, fontSize: 15, flexShrink: 1, textAlign: 'center' },
  labelOnDark: { color: colors.surface },
  labelOnLight: { color: colors.brand },
});
