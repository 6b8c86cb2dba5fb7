import { zodResolver } from '@hookform/resolvers/zod';
import { Controller, useForm } from 'react-hook-form';
import { StyleSheet, View } from 'react-native';
import { space } from '../constants/theme';
import { useInviteUser } from '../hooks/use-team';
import { inviteUserSchema, ROLE_NAMES, type InviteUserInput } from '../shared/schema/auth';
import { Button } from './ui/button';
import { Card } from './ui/card';
import { Choice } from './ui/choice';
import { Message } from './ui/message';
import { FormTextField } from './ui/form-text-field';

export const roleOptions = ROLE_NAMES.map((r) => ({ value: r, label: r[0].toUpperCase() + r.slice(1) }));

/** The administrator's invitation: name, e-mail and role, checked with the server's schema; cleared once sent. */
export function InviteForm() {
  const invite = useInviteUser();
  const { control, handleSubmit, formState, reset } = useForm<InviteUserInput>({
    resolver: zodResolver(inviteUserSchema),
    defaultValues: { email: '', name: '', role: 'engineer' },
  });
  const submit = handleSubmit((values) => invite.mutate(values, { onSuccess: () => reset() }));
  return (
    <Card title="Invite someone">
      <View style={styles.row}>
        <FormTextField control={control} name="name" label="Name" testID="invite-name" error={formState.errors.name?.message} />
        <FormTextField
          control={control}
          name="email"
          label="E-mail"
          testID="invite-email"
          autoCapitalize="none"
          keyboardType="email-address"
          error={formState.errors.email?.message}
        />
      </View>
      <Controller
        control={control}
        name="role"
        render={({ field }) => <Choice label="Role" testID="invite-role" options={roleOptions} value={field.value} onChange={field.onChange} />}
      />
      {invite.error ? <Message tone="error" text={invite.error.message} /> : null}
      {invite.isSuccess ? <Message text={`Invitation sent to ${invite.data.email}.`} testID="invite-sent" /> : null}
      <Button label="Send invitation" testID="invite-submit" onPress={submit} busy={invite.isPending} />
    </Card>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
});
