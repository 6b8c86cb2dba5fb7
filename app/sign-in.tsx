import { zodResolver } from '@hookform/resolvers/zod';
import { Redirect, useRouter } from 'expo-router';
import { Controller, useForm } from 'react-hook-form';
import { ScrollView, StyleSheet, Text, View } from 'react-native';
import { signInSchema, type SignInInput } from '../shared/schema/auth';
import { Button } from '../components/ui/button';
import { Message } from '../components/ui/message';
import { TextField } from '../components/ui/text-field';
import { CautionLine } from '../components/caution-line';
import { colors, fonts, radius, space, type } from '../constants/theme';
import { useSignIn } from '../hooks/use-auth';
import { useMe } from '../hooks/use-me';

export default function SignInScreen() {
  const router = useRouter();
  const me = useMe();
  const signIn = useSignIn();
  const { control, handleSubmit, formState } = useForm<SignInInput>({
    resolver: zodResolver(signInSchema),
    defaultValues: { email: '', password: '' },
  });
  if (me.data) return <Redirect href="/" />;
  const submit = handleSubmit((values) => signIn.mutate(values, { onSuccess: () => router.replace('/') }));

  return (
    <ScrollView style={styles.page} contentContainerStyle={styles.center} keyboardShouldPersistTaps="handled">
      <View style={styles.panel} testID="sign-in-screen">
        <Text style={styles.brand}>Voltfall</Text>
        <Text style={type.small}>Discharge and snubber evidence, reviewed and signed.</Text>
        <Controller
          control={control}
          name="email"
          render={({ field }) => (
            <TextField
              label="E-mail"
              testID="sign-in-email"
              autoComplete="email"
              keyboardType="email-address"
              autoCapitalize="none"
              value={field.value}
              onChangeText={field.onChange}
              onBlur={field.onBlur}
              error={formState.errors.email?.message}
            />
          )}
        />
        <Controller
          control={control}
          name="password"
          render={({ field }) => (
            <TextField
              label="Password"
              testID="sign-in-password"
              secureTextEntry
              autoComplete="current-password"
              value={field.value}
              onChangeText={field.onChange}
              onBlur={field.onBlur}
              onSubmitEditing={submit}
              error={formState.errors.password?.message}
            />
          )}
        />
        {signIn.error ? <Message tone="error" text={signIn.error.message} testID="sign-in-error" /> : null}
        <Button label="Sign in" testID="sign-in-submit" onPress={submit} busy={signIn.isPending} />
        <Text style={type.small}>Accounts are created by your administrator. An invitation e-mail carries the link to choose a password.</Text>
      </View>
      <View style={styles.caution}>
        <CautionLine />
      </View>
    </ScrollView>
  );
}

const styles = StyleSheet.create({
  page: { flex: 1, backgroundColor: colors.paper },
  center: { flexGrow: 1, alignItems: 'center', justifyContent: 'center', padding: space.lg, gap: space.lg },
  panel: {
    width: '100%',
    maxWidth: 420,
    backgroundColor: colors.surface,
    borderRadius: radius.lg,
    borderWidth: 1,
    borderColor: colors.line,
    padding: space.xl,
    gap: space.lg,
  },
  brand: { fontFamily: fonts.bold, fontSize: 28, color: colors.brand },
  caution: { width: '100%', maxWidth: 420 },
});
