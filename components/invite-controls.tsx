import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, radius, space, type } from '../constants/theme';
import { useResendInvite, useRevokeInvite, type TeamMember } from '../hooks/use-team';
import { formatWhen } from '../shared/dates';
import { Badge } from './ui/badge';
import { Button } from './ui/button';
import { Message } from './ui/message';

type Action = 'resend' | 'revoke';

const QUESTION: Record<Action, (name: string) => string> = {
  resend: (name) => `Send ${name} a new invitation? The link they have now stops working.`,
  revoke: (name) => `Revoke ${name}'s invitation? Its link stops working at once; you can invite them again later.`,
};

const DONE: Record<Action, (m: TeamMember) => string> = {
  resend: (m) => `A new invitation went to ${m.email}; it works until ${formatWhen(m.invite?.expiresAt ?? null)}.`,
  revoke: (m) => `${m.name}'s invitation is revoked; its link no longer works.`,
};

/** Where a pending person's invitation stands, and the admin's resend and revoke, each confirmed first. */
export function InviteControls({ member }: { member: TeamMember }) {
  const resend = useResendInvite();
  const revoke = useRevokeInvite();
  const [asking, setAsking] = useState<Action | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const run = asking === 'revoke' ? revoke : resend;
  const failed = resend.error ?? revoke.error;

  function confirm(action: Action) {
    const mutation = action === 'revoke' ? revoke : resend;
    mutation.mutate(member.id, {
      onSuccess: (updated) => {
        setDone(DONE[action](updated));
        setAsking(null);
      },
    });
  }

  function ask(action: Action) {
    resend.reset();
    revoke.reset();
    setDone(null);
    setAsking(action);
  }

  const invite = member.invite;
  return (
    <View style={styles.wrap}>
      {invite?.status === 'open' ? (
        <Badge label={`Invitation open until ${formatWhen(invite.expiresAt)}`} tone="pending" testID={`invite-state-${member.email}`} />
      ) : null}
      {invite?.status === 'expired' ? <Badge label="Invitation expired" tone="fail" testID={`invite-state-${member.email}`} /> : null}
      {invite?.status === 'revoked' ? <Badge label="Invitation revoked" tone="neutral" testID={`invite-state-${member.email}`} /> : null}
      {asking ? (
        <View style={styles.confirm} testID={`confirm-${asking}-${member.email}`}>
          <Text style={type.body}>{QUESTION[asking](member.name)}</Text>
          <View style={styles.row}>
            <Button
              label={asking === 'revoke' ? 'Revoke invitation' : 'Send new invitation'}
              variant={asking === 'revoke' ? 'danger' : 'primary'}
              testID={`confirm-${asking}-yes-${member.email}`}
              busy={run.isPending}
              onPress={() => confirm(asking)}
            />
            <Button
              label="Keep as it is"
              variant="secondary"
              testID={`confirm-${asking}-no-${member.email}`}
              disabled={run.isPending}
              onPress={() => setAsking(null)}
            />
          </View>
        </View>
      ) : (
        <View style={styles.row}>
          <Button label="Resend invitation" variant="secondary" testID={`resend-${member.email}`} onPress={() => ask('resend')} />
          {invite?.status === 'open' ? (
            <Button label="Revoke invitation" variant="secondary" testID={`revoke-${member.email}`} onPress={() => ask('revoke')} />
          ) : null}
        </View>
      )}
      {done ? <Message text={`✓ ${done}`} testID={`invite-result-${member.email}`} /> : null}
      {failed ? <Message tone="error" text={failed.message} testID={`invite-error-${member.email}`} /> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: space.sm },
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  confirm: { gap: space.sm, padding: space.md, borderRadius: radius.md, borderWidth: 1, borderColor: colors.line, backgroundColor: colors.paper },
});
