import type { ReactNode } from 'react';
import { StyleSheet, Text, View, type ViewStyle } from 'react-native';
import { colors, radius, space, type } from '../../constants/theme';

interface Props {
  title?: string;
  right?: ReactNode;
  children: ReactNode;
  testID?: string;
  style?: ViewStyle;
}

export function Card({ title, right, children, testID, style }: Props) {
  return (
    // A labelled group: screen readers announce the card's title, and layout checks find its edges.
    <View testID={testID} role="group" aria-label={title} style={[styles.card, style]}>
      {title || right ? (
        <View style={styles.header}>
          {title ? (
            <Text style={type.heading} accessibilityRole="header">
              {title}
            </Text>
          ) : null}
          {right}
        </View>
      ) : null}
      {children}
    </View>
  );
}

const styles = StyleSheet.create({
  card: {
    backgroundColor: colors.surface,
    borderRadius: radius.lg,
    borderWidth: 1,
    borderColor: colors.line,
    padding: space.lg,
    gap: space.md,
  },
  header: { flexDirection: 'row', justifyContent: 'space-between', alignItems: 'center', gap: space.sm, flexWrap: 'wrap' },
});
