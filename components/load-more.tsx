import { StyleSheet, Text, View } from 'react-native';
import { space, type } from '../constants/theme';
import type { PagedList } from '../hooks/use-paged';
import { Button } from './ui/button';

/** "Showing n of N" under a paged list, with a button for the next page while there is one. */
export function LoadMore({ list, testID }: { list: PagedList<unknown>; testID: string }) {
  if (list.total === null || list.total === 0) return null;
  return (
    <View style={styles.row}>
      <Text style={type.small} testID={`${testID}-count`}>
        Showing {list.items.length} of {list.total}
      </Text>
      {list.hasMore ? <Button label="More" variant="secondary" testID={testID} busy={list.loadingMore} onPress={list.loadMore} /> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', alignItems: 'center', gap: space.md, flexWrap: 'wrap', paddingVertical: space.sm },
});
