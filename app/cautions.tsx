import { Link } from 'expo-router';
import { ScrollView, StyleSheet, Text, View } from 'react-native';
import { CAUTIONS } from '../constants/cautions';
import { colors, fonts, space, type } from '../constants/theme';

export default function CautionsScreen() {
  return (
    <ScrollView style={styles.page} contentContainerStyle={styles.content} testID="cautions-screen">
      <Text style={type.title} accessibilityRole="header">
        Cautions
      </Text>
      {CAUTIONS.map((text, i) => (
        <View key={i} style={styles.item}>
          <Text style={styles.mark}>⚠</Text>
          <Text style={[type.body, styles.text]}>{text}</Text>
        </View>
      ))}
      <Link href="/" style={styles.link}>
        Back to Voltfall
      </Link>
    </ScrollView>
  );
}

const styles = StyleSheet.create({
  page: { flex: 1, backgroundColor: colors.paper },
  content: { padding: space.xl, gap: space.lg, maxWidth: 760, width: '100%', alignSelf: 'center' },
  item: {
    flexDirection: 'row',
    gap: space.md,
    backgroundColor: colors.surface,
    padding: space.md,
    borderLeftWidth: 4,
    borderLeftColor: colors.accent,
  },
  mark: { fontSize: 18, color: colors.accent },
  text: { flex: 1 },
  link: { fontFamily: fonts.semibold, color: colors.info, textDecorationLine: 'underline' },
});
