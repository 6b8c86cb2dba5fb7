import { Link } from 'expo-router';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, space, type } from '../constants/theme';

export default function NotFoundScreen() {
  return (
    <View style={styles.page} testID="not-found-screen">
      <Text style={type.title}>Nothing here</Text>
      <Text style={type.body}>This address does not match any Voltfall page.</Text>
      <Link href="/" style={styles.link}>
        Go to the overview
      </Link>
    </View>
  );
}

const styles = StyleSheet.create({
  page: { flex: 1, alignItems: 'center', justifyContent: 'center', gap: space.md, backgroundColor: colors.paper, padding: space.xl },
  link: { fontFamily: fonts.semibold, color: colors.info, textDecorationLine: 'underline' },
});
