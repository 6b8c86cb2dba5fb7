import { zodResolver } from '@hookform/resolvers/zod';
import { Link, Redirect, useRouter } from 'expo-router';
import { useForm } from 'react-hook-form';
import { Text } from 'react-native';
import { signInSchema, type SignInInput } from '../shared/schema/auth';
import { AuthPanel, authStyles, EmailField } from '../components/auth-panel';
import { Button } from '../components/ui/button';
import { Message } from '../components/ui/message';
import { FormTextField } from '../components/ui/form-text-field';
import { CautionLine } from '../components/caution-line';
import { type } from '../constants/theme';
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
    <AuthPanel testID="sign-in-screen" after={<CautionLine />}>
      <Text style={type.small}>Discharge and snubber evidence, reviewed and signed.</Text>
      <EmailField control={control} name="email" testID="sign-in-email" error={formState.errors.email?.message} />
      <FormTextField
        control={control}
        name="password"
        label="Password"
        testID="sign-in-password"
        secureTextEntry
        autoComplete="current-password"
        onSubmitEditing={submit}
        error={formState.errors.password?.message}
      />
      {signIn.error ? <Message tone="error" text={signIn.error.message} testID="sign-in-error" /> : null}
      <Button label="Sign in" testID="sign-in-submit" onPress={submit} busy={signIn.isPending} />
      <Link href="/forgot-password" style={authStyles.link} testID="forgot-password-link">
        Forgot password?
      </Link>
      <Text style={type.small}>Accounts are created by your administrator. An invitation e-mail carries the link to choose a password.</Text>
    </AuthPanel>
  );
}
