import { StyleSheet, Text, View } from 'react-native';
import { colors, radius, space, type } from '../../constants/theme';

/** A plain sentence for empty lists, errors and notices. */
export function Message({ text, tone = 'neutral', testID }: { text: string; tone?: 'neutral' | 'error'; testID?: string }) {
  return (
    <View testID={testID} style={[styles.box, tone === 'error' && styles.error]} accessibilityRole={tone === 'error' ? 'alert' : undefined}>
      <Text style={[type.body, tone === 'error' && { color: colors.fail }]}>{tone === 'error' ? `✕ ${text}` : text}</Text>
    </View>
  );
}

const styles = StyleSheet.create({
  box: { padding: space.md, borderRadius: radius.md, backgroundColor: colors.surface, borderWidth: 1, borderColor: colors.line },
  error: { backgroundColor: colors.failSoft, borderColor: colors.fail },
});
