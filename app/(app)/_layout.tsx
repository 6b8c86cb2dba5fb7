import { Redirect, Slot } from 'expo-router';
import { ActivityIndicator, View } from 'react-native';
import { AppShell } from '../../components/app-shell';
import { Message } from '../../components/ui/message';
import { colors } from '../../constants/theme';
import { useMe } from '../../hooks/use-me';

export default function SignedInLayout() {
  const me = useMe();
  if (me.isPending) {
    return (
      <View style={{ flex: 1, alignItems: 'center', justifyContent: 'center', backgroundColor: colors.paper }}>
        <ActivityIndicator color={colors.brand} />
      </View>
    );
  }
  if (me.isError) return <Message tone="error" text={me.error.message} testID="me-error" />;
  if (!me.data) return <Redirect href="/sign-in" />;
  return (
    <AppShell me={me.data}>
      <Slot />
    </AppShell>
  );
}
