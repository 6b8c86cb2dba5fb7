import { Link, useLocalSearchParams } from 'expo-router';
import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { RevisionChanges } from '../../../components/revision-changes';
import { RevisionDesign } from '../../../components/revision-design';
import { RevisionEvidence } from '../../../components/revision-evidence';
import { ReturnedHere, ReturnNote } from '../../../components/return-note';
import { RevisionReview } from '../../../components/revision-review';
import { StatusBadge, VerdictBadge } from '../../../components/status';
import { Tabs } from '../../../components/tabs';
import { Message } from '../../../components/ui/message';
import { Screen } from '../../../components/ui/screen';
import { colors, fonts, space, type } from '../../../constants/theme';
import { useMe } from '../../../hooks/use-me';
import { useRevision } from '../../../hooks/use-revision';

type Tab = 'design' | 'evidence' | 'changes' | 'review';
const TABS: ReadonlyArray<{ key: Tab; label: string }> = [
  { key: 'design', label: 'Design' },
  { key: 'evidence', label: 'Evidence' },
  { key: 'changes', label: 'Changes' },
  { key: 'review', label: 'Review' },
];

export default function RevisionScreen() {
  const params = useLocalSearchParams<{ id: string; tab?: Tab }>();
  const id = Number(params.id);
  const me = useMe().data!;
  const revision = useRevision(id);
  const [tab, setTab] = useState<Tab>(params.tab ?? 'design');

  if (revision.isError)
    return (
      <Screen title="Revision" testID="revision-screen">
        <Message tone="error" text={revision.error.message} />
      </Screen>
    );
  if (!revision.data)
    return (
      <Screen title="Revision" testID="revision-screen">
        <Text style={type.body}>Loading…</Text>
      </Screen>
    );
  const rev = revision.data;
  const answeredBy = rev.siblings.find((s) => s.number === rev.number + 1) ?? null;

  return (
    <Screen
      title={`Revision ${rev.number}`}
      subtitle={`${rev.dossier.title} · ${rev.dossier.product.name}`}
      testID="revision-screen"
      // The Design tab's results carry the caution line themselves; once on a screen is enough.
      showCaution={tab !== 'design'}
      actions={
        <a
          href={`/api/revisions/${rev.id}/dossier.pdf`}
          download={`voltfall-dossier-${rev.dossierId}-rev${rev.number}.pdf`}
          data-testid="export-pdf"
          style={{
            color: colors.surface,
            backgroundColor: colors.brand,
            fontFamily: fonts.semibold,
            padding: '11px 16px',
            borderRadius: 8,
            textDecoration: 'none',
          }}
        >
          {rev.status === 'approved' ? 'Export signed PDF' : 'Export draft PDF'}
        </a>
      }
    >
      <View style={styles.head}>
        <StatusBadge status={rev.status} testID="revision-status" />
        <VerdictBadge verdict={rev.results.verdict} testID="revision-verdict" />
        <Link href={`/dossiers/${rev.dossierId}`} style={styles.link} testID="to-dossier">
          All revisions of this dossier
        </Link>
      </View>
      {rev.status === 'returned' && rev.decision ? (
        <ReturnedHere
          decision={rev.decision}
          dossierId={rev.dossierId}
          answeredBy={answeredBy}
          toReader={rev.author.id === me.id}
          testID="returned-here"
        />
      ) : null}
      {rev.answersReturn ? <ReturnNote note={rev.answersReturn} toReader={rev.author.id === me.id} testID="return-note" /> : null}
      <Tabs tabs={TABS} value={tab} onChange={setTab} testID="revision-tabs" />
      {/* Kept mounted behind the other tabs: input still waiting to be saved, or a conflict, is not dropped. */}
      <View style={tab !== 'design' && styles.hidden}>
        <RevisionDesign key={`${rev.id}-${rev.status}`} revision={rev} me={me} />
      </View>
      {tab === 'evidence' ? <RevisionEvidence revision={rev} me={me} /> : null}
      {tab === 'changes' ? <RevisionChanges revision={rev} /> : null}
      {tab === 'review' ? <RevisionReview revision={rev} me={me} /> : null}
    </Screen>
  );
}

const styles = StyleSheet.create({
  head: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, alignItems: 'center' },
  link: { fontFamily: fonts.semibold, color: colors.info, textDecorationLine: 'underline' },
  hidden: { display: 'none' },
});
