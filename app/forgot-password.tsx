import { zodResolver } from '@hookform/resolvers/zod';
import { Link } from 'expo-router';
import { useForm } from 'react-hook-form';
import { Text } from 'react-native';
import type { z } from 'zod';
import { forgotPasswordSchema } from '../shared/schema/auth';
import { AuthPanel, authStyles, EmailField } from '../components/auth-panel';
import { Button } from '../components/ui/button';
import { Message } from '../components/ui/message';
import { type } from '../constants/theme';
import { useForgotPassword } from '../hooks/use-auth';

export default function ForgotPasswordScreen() {
  const forgot = useForgotPassword();
  const { control, handleSubmit, formState } = useForm<z.input<typeof forgotPasswordSchema>>({
    resolver: zodResolver(forgotPasswordSchema),
    defaultValues: { email: '' },
  });
  const submit = handleSubmit((values) => forgot.mutate(values));

  return (
    <AuthPanel testID="forgot-password-screen">
      <Text style={type.heading}>Reset your password</Text>
      {forgot.isSuccess ? (
        <Message text={forgot.data.message} testID="forgot-password-sent" />
      ) : (
        <>
          <Text style={type.body}>Enter the e-mail address of your account. We send a one-time link to choose a new password.</Text>
          <EmailField control={control} name="email" testID="forgot-password-email" error={formState.errors.email?.message} onSubmit={submit} />
          {forgot.error ? <Message tone="error" text={forgot.error.message} testID="forgot-password-error" /> : null}
          <Button label="Send the link" testID="forgot-password-submit" onPress={submit} busy={forgot.isPending} />
        </>
      )}
      <Link href="/sign-in" style={authStyles.link} testID="back-to-sign-in">
        Back to sign-in
      </Link>
    </AuthPanel>
  );
}
