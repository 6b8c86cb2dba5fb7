import { Link } from 'expo-router';
import { StyleSheet, Text, View } from 'react-native';
import { CAUTION_LINE } from '../constants/cautions';
import { colors, fonts, radius, space, type } from '../constants/theme';

export function CautionLine() {
  return (
    <View style={styles.box} testID="caution-line" accessibilityRole="summary">
      <Text style={[type.small, styles.text]}>
        ⚠ {CAUTION_LINE}{' '}
        <Link href="/cautions" style={styles.link} testID="caution-link">
          Read all cautions
        </Link>
      </Text>
    </View>
  );
}

const styles = StyleSheet.create({
  box: { borderLeftWidth: 4, borderLeftColor: colors.accent, backgroundColor: colors.pendingSoft, padding: space.md, borderRadius: radius.sm },
  text: { color: colors.ink },
  link: { fontFamily: fonts.semibold, color: colors.info, textDecorationLine: 'underline' },
});
