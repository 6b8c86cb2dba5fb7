import { StyleSheet, useWindowDimensions, View } from 'react-native';
import { RevisionList } from '../../components/revision-list';
import { Card } from '../../components/ui/card';
import { Message } from '../../components/ui/message';
import { Screen } from '../../components/ui/screen';
import { space, WIDE_BREAKPOINT } from '../../constants/theme';
import { useOverview } from '../../hooks/use-dossiers';
import { useMe } from '../../hooks/use-me';

export default function OverviewScreen() {
  const me = useMe().data!;
  const overview = useOverview();
  const wide = useWindowDimensions().width >= WIDE_BREAKPOINT;
  const authors = me.role === 'engineer' || me.role === 'admin';
  return (
    <Screen title="Overview" subtitle={`Signed in as ${me.name} (${me.role})`} testID="overview-screen" showCaution>
      {overview.isError ? <Message tone="error" text={overview.error.message} /> : null}
      {overview.data ? (
        <View style={[styles.columns, wide && styles.wide]}>
          {me.role === 'reviewer' ? (
            <Card title={`Awaiting my review (${overview.data.awaitingMyReview.length})`} style={wide ? styles.col : undefined}>
              <RevisionList items={overview.data.awaitingMyReview} empty="Nothing awaits your review." testID="awaiting-review" />
            </Card>
          ) : null}
          {authors ? (
            <Card title={`Returned to me (${overview.data.returnedToMe.length})`} style={wide ? styles.col : undefined}>
              <RevisionList items={overview.data.returnedToMe} empty="No revision of yours was returned." testID="returned-to-me" />
            </Card>
          ) : null}
          {authors ? (
            <Card title={`My drafts (${overview.data.myDrafts.length})`} style={wide ? styles.col : undefined}>
              <RevisionList items={overview.data.myDrafts} empty="You have no open drafts." testID="my-drafts" />
            </Card>
          ) : null}
          <Card title="Recently approved" style={wide ? styles.col : undefined}>
            <RevisionList items={overview.data.recentlyApproved} empty="No revision has been approved yet." testID="recently-approved" />
          </Card>
        </View>
      ) : null}
    </Screen>
  );
}

const styles = StyleSheet.create({
  columns: { gap: space.lg },
  wide: { flexDirection: 'row', alignItems: 'flex-start' },
  col: { flex: 1 },
});
