import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, radius, space } from '../../constants/theme';

export type Tone = 'pass' | 'fail' | 'pending' | 'info' | 'neutral';

const toneStyle: Record<Tone, { fg: string; bg: string; mark: string }> = {
  pass: { fg: colors.pass, bg: colors.passSoft, mark: '✓' },
  fail: { fg: colors.fail, bg: colors.failSoft, mark: '✕' },
  pending: { fg: colors.pending, bg: colors.pendingSoft, mark: '◷' },
  info: { fg: colors.info, bg: colors.infoSoft, mark: '●' },
  neutral: { fg: colors.inkMuted, bg: colors.paper, mark: '–' },
};

/** Status in words with a mark, never by colour alone. */
export function Badge({ label, tone, testID }: { label: string; tone: Tone; testID?: string }) {
  const t = toneStyle[tone];
  return (
    <View testID={testID} style={[styles.badge, { backgroundColor: t.bg, borderColor: t.fg }]} accessibilityLabel={label}>
      <Text style={[styles.text, { color: t.fg }]}>
        {t.mark} {label}
      </Text>
    </View>
  );
}

const styles = StyleSheet.create({
  badge: { borderRadius: radius.sm, borderWidth: 1, paddingHorizontal: space.sm, paddingVertical: 2, alignSelf: 'flex-start' },
  text: { fontFamily: fonts.semibold, fontSize: 12, letterSpacing: 0.2 },
});
