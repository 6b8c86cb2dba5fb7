import { Link } from 'expo-router';
import { Pressable, StyleSheet, Text, View } from 'react-native';
import { colors, space, type } from '../constants/theme';
import { formatWhen } from '../shared/dates';
import type { RevisionSummary } from '../hooks/types';
import { returnLine } from './return-note';
import { StatusBadge, VerdictBadge } from './status';
import { Message } from './ui/message';

/** Revisions as tappable rows: dossier, revision number, status and verdict in words. */
export function RevisionList({ items, empty, testID }: { items: RevisionSummary[]; empty: string; testID: string }) {
  if (items.length === 0) return <Message text={empty} testID={`${testID}-empty`} />;
  return (
    <View testID={testID}>
      {items.map((r) => (
        <Link key={r.id} href={`/revisions/${r.id}`} asChild>
          <Pressable style={styles.row} testID={`${testID}-item-${r.id}`}>
            <Text style={type.heading} numberOfLines={2}>
              {r.dossier.title}
            </Text>
            <Text style={type.small}>
              {r.dossier.productName} · revision {r.number} · {r.author.name} · {formatWhen(r.updatedAt)}
            </Text>
            <View style={styles.badges}>
              <StatusBadge status={r.status} />
              <VerdictBadge verdict={r.verdict} />
            </View>
            {r.returnNote ? (
              <Text style={[type.body, styles.reason]} testID={`${testID}-item-${r.id}-reason`}>
                {returnLine(r.returnNote)}
              </Text>
            ) : null}
          </Pressable>
        </Link>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  row: { paddingVertical: space.md, borderTopWidth: 1, borderTopColor: colors.line, gap: space.xs },
  badges: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' },
  reason: { color: colors.fail },
});
