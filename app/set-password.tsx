import { zodResolver } from '@hookform/resolvers/zod';
import { Link, useLocalSearchParams } from 'expo-router';
import { useForm } from 'react-hook-form';
import { Text, View } from 'react-native';
import { z } from 'zod';
import { passwordSchema } from '../shared/schema/auth';
import { AuthPanel, authStyles } from '../components/auth-panel';
import { Button } from '../components/ui/button';
import { Message } from '../components/ui/message';
import { FormTextField } from '../components/ui/form-text-field';
import { space, type } from '../constants/theme';
import { ApiError } from '../hooks/api';
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
  // The server judges how guessable the password is and says why on the field.
  const serverPasswordError =
    setPassword.error instanceof ApiError ? setPassword.error.fields.find((f) => f.path === 'password')?.message : undefined;

  let body;
  if (!token) body = <Message tone="error" text="This link is incomplete. Open the link from your e-mail again." testID="invite-invalid" />;
  else if (invite.isPending) body = <Text style={type.body}>Checking your link…</Text>;
  else if (invite.isError) body = <Message tone="error" text={invite.error.message} testID="invite-invalid" />;
  else if (setPassword.isSuccess)
    body = (
      <View style={{ gap: space.md }} testID="password-set">
        <Message text={`Your password is set. Sign in as ${setPassword.data.email}.`} />
        <Link href="/sign-in" style={authStyles.link}>
          Go to sign-in
        </Link>
      </View>
    );
  else
    body = (
      <>
        <Text style={type.body} testID="set-password-intro">
          {invite.data.kind === 'reset'
            ? `Choose a new password for ${invite.data.email}`
            : `Welcome, ${invite.data.name}. Choose a password for ${invite.data.email}`}{' '}
          (at least 12 characters; several unrelated words work well). Setting it signs you out everywhere else.
        </Text>
        <FormTextField
          control={control}
          name="password"
          label="New password"
          testID="set-password-new"
          secureTextEntry
          autoComplete="new-password"
          error={formState.errors.password?.message ?? serverPasswordError}
        />
        <FormTextField
          control={control}
          name="repeat"
          label="Repeat it"
          testID="set-password-repeat"
          secureTextEntry
          autoComplete="new-password"
          error={formState.errors.repeat?.message}
        />
        {setPassword.error && !serverPasswordError ? <Message tone="error" text={setPassword.error.message} /> : null}
        <Button label="Set password" testID="set-password-submit" onPress={submit} busy={setPassword.isPending} />
      </>
    );

  return <AuthPanel testID="set-password-screen">{body}</AuthPanel>;
}
