import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, radius, space, type } from '../constants/theme';
import { formatQuantity } from '../shared/units';
import type { CheckChange, Revision } from '../hooks/types';
import { useRevisionDiff } from '../hooks/use-revision';
import { VerdictBadge } from './status';
import { Badge } from './ui/badge';
import { Card } from './ui/card';
import { Choice } from './ui/choice';
import { Message } from './ui/message';

const outcome = (side: NonNullable<CheckChange['from']>) => (side.informational ? 'for information' : side.pass ? 'pass' : 'fail');

const show = (side: CheckChange['from']) => (side ? `${side.value === null ? '—' : formatQuantity(side.value, side.unit)} (${outcome(side)})` : '—');

interface CheckGroup {
  key: string;
  evidence: CheckChange['evidence'];
  checks: CheckChange[];
}

/** The design's checks first, then each capture's checks under its file, in the diff's order. */
function groupByFile(checks: readonly CheckChange[]): CheckGroup[] {
  const groups = new Map<string, CheckGroup>([['design', { key: 'design', evidence: null, checks: [] }]]);
  for (const c of checks) {
    const key = c.evidence ? c.evidence.sha256 : 'design';
    if (!groups.has(key)) groups.set(key, { key, evidence: c.evidence, checks: [] });
    groups.get(key)!.checks.push(c);
  }
  return [...groups.values()].filter((g) => g.checks.length > 0);
}

const KIND_WORDS = {
  'now-fails': 'Now fails',
  'now-passes': 'Now passes',
  'value-changed': 'Value changed',
  added: 'New check',
  removed: 'Check removed',
} as const;

/** The revision a new one is first compared with: the one it was started from, else the one before it. */
function firstCounterpart(revision: Revision, others: Revision['siblings']): number | undefined {
  const from = others.find((s) => s.id === revision.createdFrom);
  const before = [...others].reverse().find((s) => s.number < revision.number);
  return (from ?? before ?? others[0])?.id;
}

/**
 * What changed between any two revisions of a dossier, both picked here (by default this one and the one
 * it came from): inputs in units, checks, notes, evidence. Always read from the older revision to the newer.
 */
export function RevisionChanges({ revision }: { revision: Revision }) {
  const others = revision.siblings.filter((s) => s.id !== revision.id);
  const all = [...others, { id: revision.id, number: revision.number }].sort((a, b) => a.number - b.number);
  const [oneId, setOneId] = useState(revision.id);
  const [otherId, setOtherId] = useState(() => firstCounterpart(revision, others));
  const one = all.find((s) => s.id === oneId);
  const other = all.find((s) => s.id === otherId);
  const pair = one && other && one.id !== other.id ? [one, other].sort((a, b) => a.number - b.number) : null;
  const diff = useRevisionDiff(pair?.[1].id ?? revision.id, pair?.[0].id);
  if (others.length === 0)
    return (
      <Message
        text={`Revision ${revision.number} is the only revision of this dossier; there is nothing to compare it with.`}
        testID="changes-none"
      />
    );
  const options = all.map((s) => ({ value: String(s.id), label: `Revision ${s.number}${s.id === revision.id ? ' (this one)' : ''}` }));
  const picker = (
    <View style={styles.pickers}>
      <Choice label="Compare revision" testID="changes-this" options={options} value={String(oneId)} onChange={(id) => setOneId(Number(id))} />
      <Choice
        label="with revision"
        testID="changes-against"
        options={options}
        value={String(otherId ?? '')}
        onChange={(id) => setOtherId(Number(id))}
      />
    </View>
  );
  if (!pair)
    return (
      <View style={styles.wrap}>
        {picker}
        <Message text="Pick two different revisions to see what changed between them." testID="changes-same" />
      </View>
    );
  if (diff.isError)
    return (
      <View style={styles.wrap}>
        {picker}
        <Message tone="error" text={diff.error.message} />
      </View>
    );
  if (!diff.data)
    return (
      <View style={styles.wrap}>
        {picker}
        <Text style={type.body}>Comparing…</Text>
      </View>
    );
  const d = diff.data;
  return (
    <View style={styles.wrap} testID="changes">
      {picker}
      <Text style={type.small} testID="changes-direction">
        From revision {d.against.number} to revision {d.revision.number}: what revision {d.revision.number} changed.
      </Text>
      {d.verdict ? (
        <Card title="Verdict changed" testID="changes-verdict">
          <View style={styles.inline}>
            <VerdictBadge verdict={d.verdict.from} />
            <Text style={type.body}>→</Text>
            <VerdictBadge verdict={d.verdict.to} />
          </View>
        </Card>
      ) : null}
      <Card title={`Inputs (${d.inputs.length} changed)`} testID="changes-inputs">
        {d.inputs.length === 0 ? <Text style={type.body}>No input changed.</Text> : null}
        {d.inputs.map((c) => (
          <View key={c.path} style={styles.line} testID={`change-${c.path}`}>
            <Text style={styles.label}>{c.label}</Text>
            <Text style={type.body}>
              {c.from} → <Text style={styles.strong}>{c.to}</Text>
              {c.changePct !== null ? `  (${c.changePct > 0 ? '+' : ''}${c.changePct.toFixed(1)} %)` : ''}
            </Text>
          </View>
        ))}
      </Card>
      <Card title={`Checks (${d.checks.length} changed)`} testID="changes-checks">
        {d.checks.length === 0 ? <Text style={type.body}>No check result changed.</Text> : null}
        {groupByFile(d.checks).map((group) => (
          <View key={group.key} testID={group.evidence ? `check-changes-file-${group.evidence.sha256.slice(0, 12)}` : 'check-changes-design'}>
            {group.evidence ? (
              <Text style={styles.file}>
                From {group.evidence.name} <Text style={type.mono}>{group.evidence.sha256.slice(0, 12)}</Text>
              </Text>
            ) : null}
            {group.checks.map((c) => (
              <View key={c.id} style={[styles.line, c.kind === 'now-fails' && styles.alarm]} testID={`check-change-${c.id}`}>
                <View style={styles.inline}>
                  <Badge label={KIND_WORDS[c.kind]} tone={c.kind === 'now-fails' ? 'fail' : c.kind === 'now-passes' ? 'pass' : 'neutral'} />
                  <Text style={styles.label}>{c.label}</Text>
                </View>
                <Text style={type.body}>
                  {show(c.from)} → <Text style={styles.strong}>{show(c.to)}</Text>
                </Text>
              </View>
            ))}
          </View>
        ))}
      </Card>
      <Card title="Notes" testID="changes-notes">
        {!d.notes.changed ? <Text style={type.body}>Notes unchanged.</Text> : null}
        {d.notes.changed
          ? d.notes.parts.map((p, i) => (
              <Text key={i} style={[type.mono, p.added && styles.added, p.removed && styles.removed]}>
                {p.value
                  .replace(/\n$/, '')
                  .split('\n')
                  .map((l) => `${p.added ? '+ ' : p.removed ? '− ' : '  '}${l}`)
                  .join('\n')}
              </Text>
            ))
          : null}
      </Card>
      <Card title="Evidence" testID="changes-evidence">
        {d.evidence.added.length === 0 && d.evidence.removed.length === 0 ? <Text style={type.body}>Same evidence files.</Text> : null}
        {d.evidence.added.map((e) => (
          <Text key={`a${e.sha256}`} style={type.body}>
            + {e.name} ({e.kind}) <Text style={type.mono}>{e.sha256.slice(0, 16)}…</Text>
          </Text>
        ))}
        {d.evidence.removed.map((e) => (
          <Text key={`r${e.sha256}`} style={type.body}>
            − {e.name} ({e.kind}) <Text style={type.mono}>{e.sha256.slice(0, 16)}…</Text>
          </Text>
        ))}
      </Card>
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: space.lg },
  pickers: { gap: space.md },
  file: { fontFamily: fonts.semibold, fontSize: 14, color: colors.inkMuted, paddingTop: space.sm },
  line: { paddingVertical: space.sm, borderTopWidth: 1, borderTopColor: colors.line, gap: 2 },
  alarm: { backgroundColor: colors.failSoft, paddingHorizontal: space.sm, borderRadius: radius.sm },
  inline: { flexDirection: 'row', gap: space.sm, alignItems: 'center', flexWrap: 'wrap' },
  label: { fontFamily: fonts.semibold, fontSize: 14, color: colors.ink },
  strong: { fontFamily: fonts.bold },
  added: { backgroundColor: colors.passSoft, color: colors.pass },
  removed: { backgroundColor: colors.failSoft, color: colors.fail, textDecorationLine: 'line-through' },
});
