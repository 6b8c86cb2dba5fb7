import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, space, type } from '../constants/theme';
import { auditSentence } from '../shared/audit-sentences';
import { formatWhen } from '../shared/dates';
import type { AuditReport, RevisionSummary } from '../hooks/types';
import { Button } from './ui/button';
import { Card } from './ui/card';

const PAGE = 20;

/** A dossier's audit trail in full, newest first, a page at a time, each event as a sentence. */
export function AuditTrail({ report, revisions }: { report: AuditReport; revisions: readonly RevisionSummary[] }) {
  const [shown, setShown] = useState(PAGE);
  const numbers = new Map(revisions.map((r) => [r.id, r.number]));
  const events = [...report.events].reverse();
  const page = events.slice(0, shown);
  return (
    <Card
      title="Audit trail"
      testID="audit-trail"
      right={
        <Text style={[type.label, { color: report.verified ? colors.pass : colors.fail }]} testID="audit-verified">
          {report.verified ? '✓ Hash chain verified' : `✕ Chain broken at event ${report.firstBroken?.id}`}
        </Text>
      }
    >
      <Text style={type.small} testID="audit-count">
        {events.length === 0
          ? 'No events recorded.'
          : `${events.length} event${events.length === 1 ? '' : 's'}, newest first; showing ${page.length}.`}
      </Text>
      {page.map((e) => (
        <View key={e.id} style={styles.row} testID={`audit-event-${e.id}`}>
          <Text style={type.body}>{auditSentence(e, { revisionNumber: (id) => numbers.get(id) })}</Text>
          <Text style={type.small}>{formatWhen(e.createdAt)}</Text>
        </View>
      ))}
      {shown < events.length ? (
        <View style={styles.more}>
          <Button
            label={`Show ${Math.min(PAGE, events.length - shown)} older`}
            variant="secondary"
            testID="audit-more"
            onPress={() => setShown((n) => n + PAGE)}
          />
        </View>
      ) : null}
    </Card>
  );
}

const styles = StyleSheet.create({
  row: { gap: 2, paddingVertical: space.sm, borderTopWidth: 1, borderTopColor: colors.line },
  more: { alignSelf: 'flex-start' },
});
