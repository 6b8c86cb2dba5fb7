import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, radius, space, type } from '../constants/theme';
import { diffDesignInputs } from '../shared/design-diff';
import type { RevisionView } from '../shared/schema/api';
import type { DraftContent, StoredDraft } from '../hooks/use-draft-autosave';
import { Button } from './ui/button';

interface Props {
  /** What this page last had from the server. */
  base: StoredDraft;
  /** The same, in this page's form: the user's changes are counted from it. */
  synced: DraftContent;
  /** What the server holds now, saved elsewhere. */
  stored: RevisionView;
  /** The user's input on this page, not saved. */
  mine: DraftContent;
  onKeepMine: () => void;
  onTakeStored: () => void;
}

const preview = (text: string) => (text.length > 240 ? `${text.slice(0, 240)}…` : text) || '(empty)';

/** A draft saved elsewhere while this page had unsaved input: what changed there, and the user's choice. */
export function EditConflict({ base, synced, stored, mine, onKeepMine, onTakeStored }: Props) {
  const elsewhere = diffDesignInputs(base.design, stored.design);
  const mineByPath = new Map(diffDesignInputs(synced.design, mine.design).map((c) => [c.path, c]));
  const onlyMine = [...mineByPath.values()].filter((c) => !elsewhere.some((e) => e.path === c.path));
  const had = new Set(base.evidence.map((e) => e.sha256));
  const has = new Set(stored.evidence.map((e) => e.sha256));
  const added = stored.evidence.filter((e) => !had.has(e.sha256));
  const removed = base.evidence.filter((e) => !has.has(e.sha256));

  return (
    <View style={styles.box} testID="edit-conflict" accessibilityRole="alert">
      <Text style={type.heading}>⚠ Changed elsewhere — your input is not saved yet</Text>
      <Text style={type.body}>
        Revision {stored.number} was saved elsewhere (now version {stored.version}; this page had version {base.version}). Your input is kept here.
        Keeping your changes applies them on top of the stored version; inputs you did not touch keep their stored values.
      </Text>

      <Text style={styles.heading}>Changed elsewhere</Text>
      {elsewhere.length === 0 && base.notes === stored.notes && !added.length && !removed.length ? (
        <Text style={type.body}>Nothing you can see here (only the results were recomputed).</Text>
      ) : null}
      {elsewhere.map((c) => (
        <View key={c.path} style={styles.line} testID={`conflict-change-${c.path}`}>
          <Text style={styles.label}>{c.label}</Text>
          <Text style={type.body}>
            Stored now: {c.from} → <Text style={styles.strong}>{c.to}</Text>
          </Text>
          {mineByPath.has(c.path) ? (
            <Text style={type.body}>Yours: {mineByPath.get(c.path)!.to}</Text>
          ) : (
            <Text style={type.small}>You did not change this one.</Text>
          )}
        </View>
      ))}
      {base.notes !== stored.notes ? (
        <View style={styles.line} testID="conflict-notes">
          <Text style={styles.label}>Notes</Text>
          <Text style={type.body}>Stored now: {preview(stored.notes)}</Text>
          {mine.notes !== synced.notes ? <Text style={type.body}>Yours: {preview(mine.notes)}</Text> : null}
        </View>
      ) : null}
      {added.map((e) => (
        <Text key={`+${e.sha256}`} style={type.body} testID={`conflict-evidence-added-${e.sha256.slice(0, 12)}`}>
          + Evidence added: {e.originalName}
        </Text>
      ))}
      {removed.map((e) => (
        <Text key={`-${e.sha256}`} style={type.body}>
          − Evidence removed: {e.originalName}
        </Text>
      ))}

      {onlyMine.length ? (
        <>
          <Text style={styles.heading}>Your other unsaved changes</Text>
          {onlyMine.map((c) => (
            <Text key={c.path} style={type.body} testID={`conflict-mine-${c.path}`}>
              {c.label}: {c.from} → {c.to}
            </Text>
          ))}
        </>
      ) : null}

      <View style={styles.buttons}>
        <Button
          label="Keep my changes"
          testID="conflict-keep-mine"
          onPress={onKeepMine}
          accessibilityHint={`Saves your changes on top of version ${stored.version}`}
        />
        <Button
          label="Take the stored version"
          variant="secondary"
          testID="conflict-take-stored"
          onPress={onTakeStored}
          accessibilityHint="Replaces your unsaved input with what is stored"
        />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  box: {
    gap: space.sm,
    padding: space.lg,
    borderRadius: radius.md,
    borderWidth: 1,
    borderColor: colors.pending,
    backgroundColor: colors.pendingSoft,
  },
  heading: { fontFamily: fonts.semibold, fontSize: 15, color: colors.ink, marginTop: space.sm },
  line: { paddingVertical: space.xs, borderTopWidth: 1, borderTopColor: colors.line, gap: 2 },
  label: { fontFamily: fonts.semibold, fontSize: 14, color: colors.ink },
  strong: { fontFamily: fonts.bold },
  buttons: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md, marginTop: space.sm },
});
