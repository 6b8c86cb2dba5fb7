import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, radius, space, type } from '../constants/theme';
import { formatWhen } from '../shared/dates';
import type { ReturnNoteView } from '../shared/schema/api';

interface Props {
  note: ReturnNoteView;
  /** Whether the reader authored the returned revision ("returned to you"). */
  toReader: boolean;
  testID: string;
}

/** The reviewer's reason for a return, at the top of the revision that answers it. */
export function ReturnNote({ note, toReader, testID }: Props) {
  return (
    <View style={styles.box} testID={testID} accessibilityRole="summary">
      <Text style={styles.head}>
        ↩ Revision {note.number} was returned{toReader ? ' to you' : ''} by {note.reviewer.name}
      </Text>
      <Text style={type.body} testID={`${testID}-comment`}>
        “{note.comment}”
      </Text>
      <Text style={type.small}>{formatWhen(note.at)} · this revision answers it</Text>
    </View>
  );
}

/** One line for lists: "Returned to you: “…”". */
export function returnLine(note: ReturnNoteView): string {
  return `Returned to you: “${note.comment}” (${note.reviewer.name}, revision ${note.number})`;
}

const styles = StyleSheet.create({
  box: {
    gap: space.xs,
    padding: space.md,
    borderRadius: radius.sm,
    borderLeftWidth: 4,
    borderLeftColor: colors.fail,
    backgroundColor: colors.failSoft,
  },
  head: { fontFamily: fonts.semibold, fontSize: 15, lineHeight: 21, color: colors.fail },
});
