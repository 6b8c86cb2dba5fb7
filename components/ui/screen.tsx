import type { ReactNode } from 'react';
import { ScrollView, StyleSheet, Text, View } from 'react-native';
import { colors, space, type } from '../../constants/theme';
import { CautionLine } from '../caution-line';

interface Props {
  title: string;
  subtitle?: string;
  actions?: ReactNode;
  children: ReactNode;
  testID: string;
  /** Screens that show results carry the caution line. */
  showCaution?: boolean;
}

export function Screen({ title, subtitle, actions, children, testID, showCaution }: Props) {
  return (
    <ScrollView testID={testID} style={styles.scroll} contentContainerStyle={styles.content} keyboardShouldPersistTaps="handled">
      <View style={styles.header}>
        <View style={styles.titles}>
          <Text style={type.title} accessibilityRole="header">
            {title}
          </Text>
          {subtitle ? <Text style={type.small}>{subtitle}</Text> : null}
        </View>
        {actions ? <View style={styles.actions}>{actions}</View> : null}
      </View>
      {children}
      {showCaution ? <CautionLine /> : null}
    </ScrollView>
  );
}

const styles = StyleSheet.create({
  scroll: { flex: 1, backgroundColor: colors.paper },
  content: { padding: space.lg, gap: space.lg, paddingBottom: 96, maxWidth: 1280, width: '100%', alignSelf: 'center' },
  header: { flexDirection: 'row', flexWrap: 'wrap', justifyContent: 'space-between', alignItems: 'flex-start', gap: space.md },
  titles: { gap: space.xs, flexShrink: 1 },
  actions: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' },
});
