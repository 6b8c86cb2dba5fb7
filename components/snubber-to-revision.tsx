import { useRouter } from 'expo-router';
import { StyleSheet, Text, View } from 'react-native';
import { space, type } from '../constants/theme';
import type { RingingSizing } from '../shared/engine/snubber';
import type { RingingInputRaw } from '../shared/schema/snubber';
import { useOverview } from '../hooks/use-dossiers';
import { handSnubberTo, snubberFromSizing } from './snubber-handoff';
import { snubberParts } from './snubber-sizing-results';
import { Button } from './ui/button';
import { Card } from './ui/card';
import { Message } from './ui/message';

interface Props {
  sizing: RingingSizing;
  input: RingingInputRaw | null;
}

/** One tap from a sizing to a draft's snubber list: the user's open drafts, each a button. */
export function SnubberToRevision({ sizing, input }: Props) {
  const router = useRouter();
  const overview = useOverview();
  const drafts = overview.data?.myDrafts.items ?? [];
  return (
    <Card title="Add to a draft revision" testID="sizing-to-revision">
      <Text style={type.small}>
        Adds an RC snubber with {snubberParts(sizing)} and the measured loop (L_par, C_par) to the draft’s snubber list; enter its ratings, tolerance
        and location there.
      </Text>
      {overview.isError ? <Message tone="error" text={overview.error.message} /> : null}
      {overview.data && drafts.length === 0 ? (
        <Message text="You have no open draft. Start a revision from a dossier, then size the snubber again." testID="sizing-no-drafts" />
      ) : null}
      <View style={styles.list}>
        {drafts.map((d) => (
          <Button
            key={d.id}
            label={`Add to revision ${d.number} of “${d.dossier.title}”`}
            variant="secondary"
            testID={`sizing-add-to-${d.id}`}
            onPress={() => {
              handSnubberTo(d.id, snubberFromSizing(sizing, input));
              router.push(`/revisions/${d.id}`);
            }}
          />
        ))}
      </View>
    </Card>
  );
}

const styles = StyleSheet.create({
  list: { gap: space.sm, alignItems: 'flex-start' },
});
