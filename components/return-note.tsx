import { Link } from 'expo-router';
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

/**
 * At the top of a returned revision itself: the reviewer's reason, and where the answer is (the later
 * revision that answers it, or the dossier where the next one is started).
 */
export function ReturnedHere({
  decision,
  dossierId,
  answeredBy,
  toReader,
  testID,
}: {
  decision: { comment: string; reviewer: { name: string }; at: string };
  dossierId: number;
  /** The later revision started from this one, when there is one. */
  answeredBy: { id: number; number: number } | null;
  toReader: boolean;
  testID: string;
}) {
  return (
    <View style={styles.box} testID={testID} accessibilityRole="summary">
      <Text style={styles.head}>
        ↩ Returned{toReader ? ' to you' : ''} by {decision.reviewer.name}
      </Text>
      <Text style={type.body} testID={`${testID}-comment`}>
        “{decision.comment}”
      </Text>
      <Text style={type.small}>
        {formatWhen(decision.at)} ·{' '}
        {answeredBy ? (
          <Link href={`/revisions/${answeredBy.id}`} style={styles.link} testID={`${testID}-answer`}>
            revision {answeredBy.number} answers it
          </Link>
        ) : (
          <Link href={`/dossiers/${dossierId}`} style={styles.link} testID={`${testID}-dossier`}>
            answer it with the next revision, started from the dossier
          </Link>
        )}
      </Text>
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
  link: { fontFamily: fonts.semibold, color: colors.info, textDecorationLine: 'underline' },
});
