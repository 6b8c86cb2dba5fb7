import { StyleSheet, useWindowDimensions, View } from 'react-native';
import { OverviewCard } from '../../components/overview-card';
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
  const lists = overview.data;
  return (
    <Screen title="Overview" subtitle={`Signed in as ${me.name} (${me.role})`} testID="overview-screen" showCaution>
      {overview.isError ? <Message tone="error" text={overview.error.message} /> : null}
      {lists ? (
        <View style={[styles.columns, wide && styles.wide]}>
          {me.role === 'reviewer' ? (
            <OverviewCard
              list="awaitingMyReview"
              first={lists.awaitingMyReview}
              title="Awaiting my review"
              empty="Nothing awaits your review."
              testID="awaiting-review"
              style={wide ? styles.col : undefined}
            />
          ) : null}
          {authors ? (
            <OverviewCard
              list="returnedToMe"
              first={lists.returnedToMe}
              title="Returned to me"
              empty="No revision of yours was returned."
              testID="returned-to-me"
              style={wide ? styles.col : undefined}
            />
          ) : null}
          {authors ? (
            <OverviewCard
              list="myDrafts"
              first={lists.myDrafts}
              title="My drafts"
              empty="You have no open drafts."
              testID="my-drafts"
              style={wide ? styles.col : undefined}
            />
          ) : null}
          <OverviewCard
            list="recentlyApproved"
            first={lists.recentlyApproved}
            title="Recently approved"
            empty="No revision has been approved yet."
            testID="recently-approved"
            style={wide ? styles.col : undefined}
          />
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
