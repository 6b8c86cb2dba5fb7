import { StyleSheet, Text, View } from 'react-native';
import { Badge } from '../../components/ui/badge';
import { Card } from '../../components/ui/card';
import { Message } from '../../components/ui/message';
import { Screen } from '../../components/ui/screen';
import { colors, space, type } from '../../constants/theme';
import { formatWhen } from '../../shared/dates';
import { useOutbox } from '../../hooks/use-team';

export default function OutboxScreen() {
  const outbox = useOutbox();
  return (
    <Screen title="Outbox" subtitle="Development only: what the local mail server received." testID="outbox-screen">
      {outbox.isError ? <Message tone="error" text={outbox.error.message} /> : null}
      {outbox.data?.queued.length ? (
        <Card title="Waiting to be delivered">
          {outbox.data.queued.map((q) => (
            <View key={q.id} style={styles.row}>
              <Badge label={q.status === 'failed' ? 'Gave up' : `Retrying (${q.attempts})`} tone={q.status === 'failed' ? 'fail' : 'pending'} />
              <Text style={type.body}>{q.subject}</Text>
              <Text style={type.small}>
                To {q.to}
                {q.lastError ? ` — ${q.lastError}` : ''}
              </Text>
            </View>
          ))}
        </Card>
      ) : null}
      {outbox.data && outbox.data.messages.length === 0 ? <Message text="No messages yet." testID="outbox-empty" /> : null}
      {outbox.data?.messages.map((m) => (
        <Card key={m.id} title={m.subject} testID={`outbox-message-${m.id}`}>
          <Text style={type.small}>
            To {m.to} · {formatWhen(m.receivedAt)}
          </Text>
          <Text style={[type.mono, styles.body]}>{m.text}</Text>
        </Card>
      ))}
    </Screen>
  );
}

const styles = StyleSheet.create({
  row: { gap: space.xs, paddingVertical: space.sm, borderTopWidth: 1, borderTopColor: colors.line },
  body: { backgroundColor: colors.paper, padding: space.md },
});
