import { Link, useRouter } from 'expo-router';
import { StyleSheet, Text, View } from 'react-native';
import { navFor } from '../../components/app-shell';
import { Button } from '../../components/ui/button';
import { Card } from '../../components/ui/card';
import { Screen } from '../../components/ui/screen';
import { colors, fonts, space, type } from '../../constants/theme';
import { useSignOut } from '../../hooks/use-auth';
import { useMe } from '../../hooks/use-me';

export default function AccountScreen() {
  const me = useMe().data!;
  const signOut = useSignOut();
  const router = useRouter();
  const more = navFor(me).filter((i) => !i.bottom);
  return (
    <Screen title="Account" testID="account-screen">
      <Card title={me.name}>
        <Text style={type.body}>{me.email}</Text>
        <Text style={type.small}>Role: {me.role}</Text>
      </Card>
      {more.length ? (
        <Card title="More">
          {more.map((item) => (
            <Link key={item.href} href={item.href as never} style={styles.link} testID={`more-${item.short.toLowerCase()}`}>
              {item.glyph} {item.label}
            </Link>
          ))}
          <Link href="/cautions" style={styles.link}>
            ⚠ Cautions
          </Link>
        </Card>
      ) : null}
      <View>
        <Button
          label="Sign out"
          variant="secondary"
          testID="sign-out"
          busy={signOut.isPending}
          onPress={() => signOut.mutate(undefined, { onSettled: () => router.replace('/sign-in') })}
        />
      </View>
    </Screen>
  );
}

const styles = StyleSheet.create({
  link: { fontFamily: fonts.medium, fontSize: 16, color: colors.info, paddingVertical: space.sm },
});
