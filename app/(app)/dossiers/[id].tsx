import { Link, useLocalSearchParams, useRouter } from 'expo-router';
import { Pressable, StyleSheet, Text, View } from 'react-native';
import { singleFaultText } from '../../../components/requirement-editor';
import { AuditTrail } from '../../../components/audit-trail';
import { formatWhen } from '../../../shared/dates';
import { StatusBadge, VerdictBadge } from '../../../components/status';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { Message } from '../../../components/ui/message';
import { Screen } from '../../../components/ui/screen';
import { colors, fonts, space, type } from '../../../constants/theme';
import { formatQuantity } from '../../../shared/units';
import { useDossier, useStartRevision } from '../../../hooks/use-dossiers';
import { useMe } from '../../../hooks/use-me';
import { useAudit } from '../../../hooks/use-revision';

export default function DossierScreen() {
  const id = Number(useLocalSearchParams<{ id: string }>().id);
  const me = useMe().data!;
  const router = useRouter();
  const dossier = useDossier(id);
  const start = useStartRevision(id);
  const audit = useAudit(id, me.role === 'reviewer' || me.role === 'admin');

  if (dossier.isError)
    return (
      <Screen title="Dossier" testID="dossier-screen">
        <Message tone="error" text={dossier.error.message} />
      </Screen>
    );
  if (!dossier.data)
    return (
      <Screen title="Dossier" testID="dossier-screen">
        <Text style={type.body}>Loading…</Text>
      </Screen>
    );
  const d = dossier.data;
  const openDraft = d.revisions.find((r) => r.status === 'draft');
  const latest = d.revisions[0];
  const canStart = (me.role === 'engineer' || me.role === 'admin') && !openDraft && latest;
  const signed = d.revisions.filter((r) => r.status === 'approved');

  return (
    <Screen title={d.title} subtitle={`${d.product.name} · ${d.product.modelNumber}`} testID="dossier-screen" showCaution>
      <Card title="Requirement">
        <Text style={type.body} testID="dossier-limit">
          At most {formatQuantity(d.requirement.safeVoltage, 'V')} within {formatQuantity(d.requirement.maxTime, 's')}
          {d.requirement.maxEnergy ? `, or stored energy below ${formatQuantity(d.requirement.maxEnergy, 'J')}` : ''}
          {d.requirement.maxCharge ? `, or stored charge below ${formatQuantity(d.requirement.maxCharge, 'C')}` : ''}
          {d.requirement.fallbackMaxTime ? `; bleeders alone within ${formatQuantity(d.requirement.fallbackMaxTime, 's')}` : ''}
        </Text>
        {singleFaultText(d.requirement) ? (
          <Text style={type.body} testID="dossier-single-fault">
            {singleFaultText(d.requirement)}
          </Text>
        ) : null}
        {d.requirement.condition ? <Text style={type.small}>Condition: {d.requirement.condition}</Text> : null}
        {d.requirement.reference ? <Text style={type.small}>Worked to: {d.requirement.reference}</Text> : null}
      </Card>

      <Card
        title="Revisions"
        right={
          canStart ? (
            <Button
              label={`Start revision ${latest.number + 1} from ${latest.number}`}
              testID="start-revision"
              busy={start.isPending}
              onPress={() => start.mutate(latest.id, { onSuccess: (rev) => router.push(`/revisions/${rev.id}`) })}
            />
          ) : null
        }
      >
        {start.error ? <Message tone="error" text={start.error.message} /> : null}
        {openDraft ? <Text style={type.small}>Revision {openDraft.number} is the open draft; one draft at a time per dossier.</Text> : null}
        {d.revisions.map((r) => (
          <Link key={r.id} href={`/revisions/${r.id}`} asChild>
            <Pressable style={styles.row} testID={`revision-row-${r.number}`}>
              <View style={styles.rowHead}>
                <Text style={styles.number}>Revision {r.number}</Text>
                <StatusBadge status={r.status} />
                <VerdictBadge verdict={r.verdict} />
              </View>
              <Text style={type.small}>
                {r.author.name}
                {r.createdFrom ? ` · started from revision ${d.revisions.find((o) => o.id === r.createdFrom)?.number ?? '?'}` : ''} · created{' '}
                {formatWhen(r.createdAt)}
                {r.submittedAt ? ` · submitted ${formatWhen(r.submittedAt)}` : ''}
                {r.decidedAt ? ` · decided ${formatWhen(r.decidedAt)}` : ''}
              </Text>
            </Pressable>
          </Link>
        ))}
      </Card>

      <Card title="Signed dossiers">
        {signed.length === 0 ? <Text style={type.body}>No approved revision yet.</Text> : null}
        {signed.map((r) => (
          <View key={r.id} style={styles.row} testID={`signed-pdf-${r.number}`}>
            <Text style={type.body}>
              Revision {r.number}, approved {formatWhen(r.decidedAt)}
            </Text>
            <a
              href={`/api/revisions/${r.id}/dossier.pdf`}
              download={`voltfall-dossier-${d.id}-rev${r.number}.pdf`}
              style={{ color: colors.info, fontFamily: fonts.semibold }}
            >
              Download signed PDF
            </a>
            {r.signedPdf ? (
              <Text style={[type.mono, styles.hash]}>sha256 {r.signedPdf.sha256}</Text>
            ) : (
              <Text style={type.small}>No stored copy yet: the first download signs it and keeps it; later downloads return those same bytes.</Text>
            )}
          </View>
        ))}
      </Card>

      {audit.data ? <AuditTrail report={audit.data} revisions={d.revisions} /> : null}
    </Screen>
  );
}

const styles = StyleSheet.create({
  row: { paddingVertical: space.md, borderTopWidth: 1, borderTopColor: colors.line, gap: space.xs },
  rowHead: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.sm },
  number: { fontFamily: fonts.semibold, fontSize: 16, color: colors.ink },
  hash: { fontSize: 11 },
});
