import type { ViewStyle } from 'react-native';
import type { OverviewList, Page, RevisionSummary } from '../hooks/types';
import { useOverviewList } from '../hooks/use-dossiers';
import { LoadMore } from './load-more';
import { RevisionList } from './revision-list';
import { Card } from './ui/card';

interface Props {
  list: OverviewList;
  first: Page<RevisionSummary>;
  title: string;
  empty: string;
  testID: string;
  style?: ViewStyle;
}

/** One Overview list in a card: its total in the title, the first page, and "More" for the rest. */
export function OverviewCard({ list, first, title, empty, testID, style }: Props) {
  const paged = useOverviewList(list, first);
  return (
    <Card title={`${title} (${paged.total ?? first.total})`} style={style}>
      <RevisionList items={paged.items} empty={empty} testID={testID} />
      <LoadMore list={paged} testID={`${testID}-more`} />
    </Card>
  );
}
