import * as DocumentPicker from 'expo-document-picker';
import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, radius, space, type } from '../constants/theme';
import { formatQuantity } from '../shared/units';
import type { EvidenceRecord, Revision } from '../hooks/types';
import type { Me } from '../hooks/use-me';
import { useRemoveEvidence, useUploadEvidence, type EvidenceKind } from '../hooks/use-evidence';
import { DecayChart } from './decay-chart';
import { ProbeResistanceField, type ProbeEntry } from './probe-resistance-field';
import { measuredTraces } from './revision-design';
import { formatWhen } from '../shared/dates';
import { Badge } from './ui/badge';
import { Button } from './ui/button';
import { Card } from './ui/card';
import { Choice } from './ui/choice';
import { ConfirmDialog } from './ui/confirm-dialog';
import { Message } from './ui/message';
import { TextFields, type TextFieldSpec } from './ui/text-fields';

const KINDS: Array<{ value: EvidenceKind; label: string }> = [
  { value: 'waveform', label: 'Scope capture (CSV/TXT)' },
  { value: 'image', label: 'Photo / image' },
  { value: 'datasheet', label: 'Datasheet (PDF)' },
  { value: 'report', label: 'Test report (PDF)' },
  { value: 'other', label: 'Other' },
];

const PICKER_TYPES: Record<EvidenceKind, string[]> = {
  waveform: ['text/csv', 'text/plain', 'text/tab-separated-values', '.csv', '.txt', '.tsv'],
  image: ['image/*'],
  datasheet: ['application/pdf'],
  report: ['application/pdf'],
  other: ['*/*'],
};

type CaptureTexts = { channel: string; markerChannel: string; t0: string; scale: string };

/** How to read a scope capture, as typed with the upload; each may stay empty. */
const CAPTURE_FIELDS: ReadonlyArray<TextFieldSpec<keyof CaptureTexts>> = [
  {
    key: 'channel',
    label: 'Voltage channel (optional)',
    testID: 'capture-channel',
    placeholder: 'first channel',
    hint: 'Column name or 0-based index',
  },
  {
    key: 'markerChannel',
    label: 'Disconnect marker channel (optional)',
    testID: 'capture-marker',
    placeholder: 'none',
    hint: 'Its edge marks the disconnect instant',
  },
  { key: 't0', label: 'Disconnect instant t0 (optional, s)', testID: 'capture-t0', placeholder: 'detected', hint: "On the capture's own time axis" },
  {
    key: 'scale',
    label: 'Voltage scale (optional, ×)',
    testID: 'capture-scale',
    placeholder: '1',
    hint: 'For probe-side volts: 100 for a 100:1 probe',
  },
];

const bytes = (n: number) => (n >= 1024 * 1024 ? `${(n / 1024 / 1024).toFixed(1)} MB` : n >= 1024 ? `${(n / 1024).toFixed(0)} kB` : `${n} B`);

/** The Evidence tab: files with their hashes, waveform analyses, and the measured-versus-predicted chart. */
export function RevisionEvidence({ revision, me }: { revision: Revision; me: Me }) {
  const editable = revision.status === 'draft' && (revision.author.id === me.id || me.role === 'admin');
  const [kind, setKind] = useState<EvidenceKind>('waveform');
  const [capture, setCapture] = useState<CaptureTexts>({ channel: '', markerChannel: '', t0: '', scale: '' });
  const [probe, setProbe] = useState<ProbeEntry>({ value: null, invalid: false });
  const upload = useUploadEvidence(revision.id, revision.dossierId);
  const remove = useRemoveEvidence(revision.id);
  const measured = measuredTraces(revision);
  // Removing asks first; once the server has removed the file the tab says so.
  const [toRemove, setToRemove] = useState<EvidenceRecord | null>(null);
  const [removed, setRemoved] = useState<string | null>(null);
  const confirmRemoval = (e: EvidenceRecord) =>
    remove.mutate(
      { evidenceId: e.id, version: revision.version },
      {
        onSuccess: () => {
          setToRemove(null);
          setRemoved(e.originalName);
        },
      },
    );

  async function pick() {
    const picked = await DocumentPicker.getDocumentAsync({ type: PICKER_TYPES[kind], multiple: false, copyToCacheDirectory: false });
    const asset = picked.canceled ? null : picked.assets[0];
    const probeResistance = probe.value === null ? undefined : String(probe.value);
    if (asset?.file)
      upload.mutate({
        file: asset.file,
        name: asset.name,
        kind,
        version: revision.version,
        ...(kind === 'waveform' ? { ...capture, probeResistance } : {}),
      });
  }

  return (
    <View style={styles.wrap} testID="evidence-tab">
      {editable ? (
        <Card title="Add evidence">
          <Choice label="Kind" testID="evidence-kind" options={KINDS} value={kind} onChange={setKind} />
          {kind === 'waveform' ? (
            <TextFields fields={CAPTURE_FIELDS} value={capture} onChange={setCapture}>
              <ProbeResistanceField entry={probe} onChange={setProbe} />
            </TextFields>
          ) : null}
          {upload.progress !== null ? (
            <View style={styles.progress} testID="upload-progress">
              <View style={[styles.bar, { width: `${Math.round(upload.progress * 100)}%` }]} />
              <Text style={type.small}>Uploading… {Math.round(upload.progress * 100)} %</Text>
            </View>
          ) : null}
          {upload.error ? <Message tone="error" text={upload.error.message} testID="upload-error" /> : null}
          {remove.error ? <Message tone="error" text={remove.error.message} testID="remove-error" /> : null}
          <View style={styles.button}>
            <Button
              label="Choose a file"
              testID="choose-file"
              busy={upload.isPending}
              disabled={kind === 'waveform' && probe.invalid}
              onPress={pick}
            />
          </View>
        </Card>
      ) : (
        <Message
          text={
            revision.status === 'draft' ? 'Only the author adds evidence to this draft.' : 'This revision is frozen; its evidence list cannot change.'
          }
        />
      )}

      {measured.length ? (
        <Card title="Measured against predicted" testID="evidence-overlay">
          <DecayChart curve={revision.results.curve} requirement={revision.dossier.requirement} measured={measured} />
        </Card>
      ) : null}

      {removed ? (
        <Message
          text={`✓ Removed “${removed}” from revision ${revision.number}; its results were recomputed without it.`}
          testID="evidence-removed"
        />
      ) : null}
      {revision.evidence.length === 0 ? <Message text="No evidence attached yet." testID="evidence-empty" /> : null}
      {revision.evidence.map((e) => (
        <Card
          key={e.id}
          title={e.originalName}
          testID={`evidence-${e.id}`}
          right={<Badge label={KINDS.find((k) => k.value === e.kind)?.label ?? e.kind} tone="info" />}
        >
          <Text style={type.small}>
            {bytes(e.size)} · {e.mediaType} · {e.uploadedBy.name} · {formatWhen(e.uploadedAt)}
          </Text>
          <Text style={[type.mono, styles.hash]} selectable>
            sha256 {e.sha256}
          </Text>
          {e.analysis ? (
            <View style={styles.analysis} testID={`analysis-${e.id}`}>
              <Text style={type.body}>
                Channel {e.analysis.channel}: V0 {formatQuantity(e.analysis.v0, 'V')}; {e.analysis.samples.toLocaleString()} samples
                {e.analysis.skipped ? `, ${e.analysis.skipped} unreadable skipped` : ''}.
              </Text>
              {e.analysis.channels.length > 1 ? <Text style={type.small}>Channels in the file: {e.analysis.channels.join(', ')}.</Text> : null}
              <Text style={[type.body, styles.strong]}>
                {e.analysis.timeToSafe === null
                  ? `✕ Never fell below ${formatQuantity(revision.dossier.requirement.safeVoltage, 'V')} in the capture.`
                  : `Below ${formatQuantity(revision.dossier.requirement.safeVoltage, 'V')} after ${formatQuantity(e.analysis.timeToSafe, 's')}.`}
              </Text>
              <Text style={type.body}>
                {e.analysis.fit === 'good' && e.analysis.tau !== null
                  ? `Fitted time constant ${formatQuantity(e.analysis.tau, 's')} (R² ${e.analysis.rSquared?.toFixed(4) ?? '—'}).`
                  : 'Not a clean exponential (poor fit): only the crossing time is used.'}
              </Text>
              <Text style={type.body} testID={`analysis-${e.id}-probe`}>
                {e.analysis.probeResistance
                  ? `Instrument input ${formatQuantity(e.analysis.probeResistance, 'Ω')} across the capacitor: corrected for in the checks.`
                  : 'No instrument input resistance given: loading not corrected.'}
              </Text>
              <MeasuredFigure revision={revision} evidenceId={e.id} />
              {e.analysis.warnings?.map((w, i) => (
                <Text key={`w${i}`} style={[type.small, styles.strong]} testID={`analysis-warning-${e.id}`}>
                  ⚠ {w}
                </Text>
              ))}
              {e.analysis.notes
                ?.filter((n) => !e.analysis?.warnings?.includes(n))
                .map((n, i) => (
                  <Text key={i} style={type.small}>
                    · {n}
                  </Text>
                ))}
            </View>
          ) : null}
          <View style={styles.row}>
            <a href={`/api/evidence/${e.id}/file`} download={e.originalName} style={{ color: colors.info, fontFamily: fonts.semibold }}>
              Download
            </a>
            {editable ? (
              <Button
                label="Remove"
                variant="quiet"
                testID={`remove-evidence-${e.id}`}
                onPress={() => {
                  remove.reset();
                  setToRemove(e);
                }}
              />
            ) : null}
          </View>
        </Card>
      ))}
      <ConfirmDialog
        visible={toRemove !== null}
        title={toRemove ? `Remove “${toRemove.originalName}” from revision ${revision.number}?` : ''}
        consequences={[
          'The file leaves this draft’s evidence list' + (toRemove?.analysis ? ', and its measured check leaves the results.' : '.'),
          'Earlier revisions that list the same file keep it, and the audit trail records the removal.',
        ]}
        confirmLabel="Remove the file"
        tone="danger"
        busy={remove.isPending}
        error={remove.error?.message}
        onCancel={() => setToRemove(null)}
        onConfirm={() => toRemove && confirmRemoval(toRemove)}
        testID="remove-evidence-dialog"
      />
    </View>
  );
}

/** What the capture counts as in the results: its measured-discharge check, referred to the worst case. */
function MeasuredFigure({ revision, evidenceId }: { revision: Revision; evidenceId: number }) {
  const check = revision.results.checks.find((c) => c.evidenceId === evidenceId && c.id.split(':')[0] === 'measured-discharge');
  if (!check?.referral) return null;
  const { referral } = check;
  const counted =
    check.value === null
      ? 'Counts as no value: see the check on the Design tab.'
      : referral.start === 'referred'
        ? `Counts as ${formatQuantity(check.value, 's')} from the ${formatQuantity(referral.maxVoltage, 'V')} maximum bus (referred from ${formatQuantity(referral.v0, 'V')}).`
        : `Counts as ${formatQuantity(check.value, 's')}.`;
  return (
    <Text style={[type.body, styles.strong]} testID={`analysis-${evidenceId}-counted`}>
      {counted}
    </Text>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: space.lg },
  button: { alignSelf: 'flex-start' },
  hash: { fontSize: 11, color: colors.inkMuted },
  analysis: { gap: space.xs, backgroundColor: colors.paper, padding: space.md, borderRadius: radius.md },
  strong: { fontFamily: fonts.semibold },
  row: { flexDirection: 'row', gap: space.lg, alignItems: 'center' },
  progress: { gap: space.xs },
  bar: { height: 6, backgroundColor: colors.brand, borderRadius: 3 },
});
