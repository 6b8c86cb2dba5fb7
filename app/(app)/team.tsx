import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { InviteControls } from '../../components/invite-controls';
import { InviteForm, roleOptions } from '../../components/invite-form';
import { changeDone, TeamChangeDialog, type TeamChange } from '../../components/team-change-dialog';
import { Badge } from '../../components/ui/badge';
import { Button } from '../../components/ui/button';
import { Card } from '../../components/ui/card';
import { Choice } from '../../components/ui/choice';
import { Message } from '../../components/ui/message';
import { Screen } from '../../components/ui/screen';
import { colors, space, type } from '../../constants/theme';
import { useMe } from '../../hooks/use-me';
import { useTeam, useUpdateUser } from '../../hooks/use-team';

export default function TeamScreen() {
  const me = useMe().data!;
  const team = useTeam();
  const update = useUpdateUser();
  // Role changes and disabling ask first, then say what took effect.
  const [change, setChange] = useState<TeamChange | null>(null);
  // The confirmation sits on the row that changed, where the admin is looking.
  const [done, setDone] = useState<{ userId: string; text: string } | null>(null);
  const apply = (c: TeamChange) =>
    update.mutate(
      { id: c.user.id, ...('role' in c ? { role: c.role } : { disabled: true }) },
      {
        onSuccess: (after) => {
          setChange(null);
          setDone({ userId: after.id, text: changeDone(c, after) });
        },
      },
    );
  const ask = (c: TeamChange) => {
    update.reset();
    setDone(null);
    setChange(c);
  };
  if (me.role !== 'admin')
    return (
      <Screen title="Team" testID="team-screen">
        <Message text="Only administrators manage the team." />
      </Screen>
    );

  return (
    <Screen title="Team" subtitle="Invite people, resend or revoke invitations, set roles, disable accounts." testID="team-screen">
      <InviteForm />
      <Card title="People">
        {team.isError ? <Message tone="error" text={team.error.message} /> : null}
        {team.data?.map((user) => (
          <View key={user.id} style={styles.person} testID={`team-row-${user.email}`}>
            <View style={styles.personHead}>
              <Text style={type.heading}>{user.name}</Text>
              {user.disabled ? (
                <Badge label="Disabled" tone="fail" />
              ) : user.invitePending ? (
                <Badge label="No password yet" tone="pending" />
              ) : (
                <Badge label="Active" tone="pass" />
              )}
            </View>
            <Text style={type.small}>{user.email}</Text>
            {user.invitePending && !user.disabled ? <InviteControls member={user} /> : null}
            <Choice
              label="Role"
              testID={`role-${user.email}`}
              options={roleOptions}
              value={user.role}
              disabled={user.id === me.id}
              onChange={(role) => (role === user.role ? undefined : ask({ user, role }))}
            />
            {user.id !== me.id ? (
              <View style={{ alignSelf: 'flex-start' }}>
                <Button
                  label={user.disabled ? 'Enable account' : 'Disable account'}
                  variant={user.disabled ? 'secondary' : 'danger'}
                  testID={`toggle-${user.email}`}
                  onPress={() =>
                    user.disabled
                      ? update.mutate(
                          { id: user.id, disabled: false },
                          { onSuccess: (after) => setDone({ userId: after.id, text: `✓ The account of ${after.name} is enabled again.` }) },
                        )
                      : ask({ user, disabled: true })
                  }
                />
              </View>
            ) : null}
            {done?.userId === user.id ? <Message text={done.text} testID="team-notice" /> : null}
          </View>
        ))}
        {update.error && !change ? <Message tone="error" text={update.error.message} /> : null}
      </Card>
      <TeamChangeDialog
        change={change}
        busy={update.isPending}
        error={update.error?.message ?? null}
        onConfirm={apply}
        onCancel={() => setChange(null)}
      />
    </Screen>
  );
}

const styles = StyleSheet.create({
  person: { gap: space.sm, paddingVertical: space.md, borderTopWidth: 1, borderTopColor: colors.line },
  personHead: { flexDirection: 'row', gap: space.sm, alignItems: 'center', flexWrap: 'wrap' },
});
