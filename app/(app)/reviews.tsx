import { Link } from 'expo-router';
import { Pressable, StyleSheet, Text, View } from 'react-native';
import { LoadMore } from '../../components/load-more';
import { formatWhen } from '../../shared/dates';
import { VerdictBadge } from '../../components/status';
import { Card } from '../../components/ui/card';
import { Message } from '../../components/ui/message';
import { Screen } from '../../components/ui/screen';
import { colors, space, type } from '../../constants/theme';
import { useReviewQueue } from '../../hooks/use-revision';

export default function ReviewsScreen() {
  const queue = useReviewQueue();
  return (
    <Screen title="Reviews" subtitle="Revisions awaiting a decision, oldest first." testID="reviews-screen">
      {queue.error ? <Message tone="error" text={queue.error.message} /> : null}
      {queue.total === 0 ? <Message text="Nothing awaits review." testID="reviews-empty" /> : null}
      {queue.items.map((r) => (
        <Link key={r.id} href={`/revisions/${r.id}?tab=review`} asChild>
          <Pressable testID={`review-item-${r.id}`}>
            <Card title={r.dossier.title}>
              <Text style={type.small}>
                {r.dossier.productName} · revision {r.number} by {r.author.name} · submitted {formatWhen(r.submittedAt)}
              </Text>
              <View style={styles.row}>
                <VerdictBadge verdict={r.verdict} />
                <Text style={[type.small, !r.mayDecide && styles.muted]}>
                  {r.mayDecide ? 'You may decide' : 'You authored it or are not a reviewer: view only'}
                </Text>
              </View>
            </Card>
          </Pressable>
        </Link>
      ))}
      <LoadMore list={queue} testID="reviews-more" />
    </Screen>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', gap: space.sm, alignItems: 'center', flexWrap: 'wrap' },
  muted: { color: colors.inkMuted },
});
