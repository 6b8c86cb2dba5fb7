import { zodResolver } from '@hookform/resolvers/zod';
import { Link, useLocalSearchParams } from 'expo-router';
import { Controller, useForm } from 'react-hook-form';
import { ScrollView, StyleSheet, Text, View } from 'react-native';
import { z } from 'zod';
import { passwordSchema } from '../shared/schema/auth';
import { Button } from '../components/ui/button';
import { Message } from '../components/ui/message';
import { TextField } from '../components/ui/text-field';
import { colors, fonts, radius, space, type } from '../constants/theme';
import { useInvite, useSetPassword } from '../hooks/use-auth';

const formSchema = z
  .object({ password: passwordSchema, repeat: z.string() })
  .refine((v) => v.password === v.repeat, { path: ['repeat'], message: 'The two passwords differ.' });

export default function SetPasswordScreen() {
  const { token = '' } = useLocalSearchParams<{ token?: string }>();
  const invite = useInvite(token);
  const setPassword = useSetPassword();
  const { control, handleSubmit, formState } = useForm<z.infer<typeof formSchema>>({
    resolver: zodResolver(formSchema),
    defaultValues: { password: '', repeat: '' },
  });
  const submit = handleSubmit(({ password }) => setPassword.mutate({ token, password }));

  let body;
  if (!token) body = <Message tone="error" text="This link is incomplete. Open the link from your invitation e-mail." testID="invite-invalid" />;
  else if (invite.isPending) body = <Text style={type.body}>Checking your link…</Text>;
  else if (invite.isError) body = <Message tone="error" text={invite.error.message} testID="invite-invalid" />;
  else if (setPassword.isSuccess)
    body = (
      <View style={{ gap: space.md }} testID="password-set">
        <Message text={`Your password is set. Sign in as ${setPassword.data.email}.`} />
        <Link href="/sign-in" style={styles.link}>
          Go to sign-in
        </Link>
      </View>
    );
  else
    body = (
      <>
        <Text style={type.body}>
          Welcome, {invite.data.name}. Choose a password for {invite.data.email} (at least 12 characters).
        </Text>
        <Controller
          control={control}
          name="password"
          render={({ field }) => (
            <TextField label="New password" testID="set-password-new" secureTextEntry autoComplete="new-password" value={field.value} onChangeText={field.onChange} error={formState.errors.password?.message} />
          )}
        />
        <Controller
          control={control}
          name="repeat"
          render={({ field }) => (
            <TextField label="Repeat it" testID="set-password-repeat" secureTextEntry autoComplete="new-password" value={field.value} onChangeText={field.onChange} error={formState.errors.repeat?.message} />
          )}
        />
        {setPassword.error ? <Message tone="error" text={setPassword.error.message} /> : null}
        <Button label="Set password" testID="set-password-submit" onPress={submit} busy={setPassword.isPending} />
      </>
    );

  return (
    <ScrollView style={styles.page} contentContainerStyle={styles.center}>
      <View style={styles.panel} testID="set-password-screen">
        <Text style={styles.brand}>Voltfall</Text>
        {body}
      </View>
    </ScrollView>
  );
}

const styles = StyleSheet.create({
  page: { flex: 1, backgroundColor: colors.paper },
  center: { flexGrow: 1, alignItems: 'center', justifyContent: 'center', padding: space.lg },
  panel: { width: '100%', maxWidth: 420, backgroundColor: colors.surface, borderRadius: radius.lg, borderWidth: 1, borderColor: colors.line, padding: space.xl, gap: space.lg },
  brand: { fontFamily: fonts.bold, fontSize: 28, color: colors.brand },
  link: { fontFamily: fonts.semibold, color: colors.info, textDecorationLine: 'underline' },
});
