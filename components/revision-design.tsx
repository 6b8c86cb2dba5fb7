import { useEffect, useRef, useState } from 'react';
import { StyleSheet, Text, useWindowDimensions, View } from 'react-native';
import { colors, space, type, WIDE_BREAKPOINT } from '../constants/theme';
import { formatWhen } from '../shared/dates';
import { formatQuantity } from '../shared/units';
import type { FieldError } from '../hooks/api';
import type { Revision } from '../hooks/types';
import { useDraftAutosave, type SaveState } from '../hooks/use-draft-autosave';
import type { Me } from '../hooks/use-me';
import { DesignEditor } from './design-editor';
import { EditConflict } from './edit-conflict';
import { singleFaultText } from './requirement-editor';
import { ResultsPanel } from './results-panel';
import { dropHandedSnubber, peekHandedSnubber } from './snubber-handoff';
import { SnubberListEditor } from './snubber-list-editor';
import { Card } from './ui/card';
import { Message } from './ui/message';
import { TextField } from './ui/text-field';

/** Measured traces, shifted so t = 0 is the disconnect instant like the predicted curves. */
export function measuredTraces(revision: Pick<Revision, 'evidence'>) {
  return revision.evidence
    .filter((e) => e.analysis)
    .map((e) => ({ name: e.originalName, trace: e.analysis!.trace.map((p) => ({ t: p.t - e.analysis!.t0, v: p.v })).filter((p) => p.t >= 0) }));
}

function saveWords(state: SaveState, editable: boolean, status: string): string {
  switch (state.kind) {
    case 'saving':
      return 'Saving…';
    case 'saved':
      return `Saved ${formatWhen(state.at)} ✓`;
    case 'invalid':
      return '✕ Not saved: some inputs were not accepted.';
    case 'failed':
      return `✕ Not saved: ${state.message}`;
    case 'conflict':
      return '⚠ Not saved: this draft was changed elsewhere; choose below.';
    case 'idle':
      return editable ? 'Changes save as you type.' : `Frozen: ${status.replace('_', ' ')}.`;
  }
}

/** The Design tab: inputs and notes (saved as they are typed, while a draft), and the server's results. */
export function RevisionDesign({ revision, me }: { revision: Revision; me: Me }) {
  const editable = revision.status === 'draft' && (revision.author.id === me.id || me.role === 'admin');
  const { content, edit, state, keepMine, takeStored } = useDraftAutosave(revision, editable);
  const { design, notes } = content;
  const errors: FieldError[] = state.kind === 'invalid' ? state.fields : [];
  const wide = useWindowDimensions().width >= WIDE_BREAKPOINT;
  const saveProblem = state.kind === 'invalid' || state.kind === 'failed' || state.kind === 'conflict';
  // A snubber handed over from the sizing screen joins the list once, and is saved like a typed one.
  const [handed] = useState(() => peekHandedSnubber(revision.id));
  // Once, when the tab opens: the ref keeps later renders (and a remount in development) from adding it again.
  const joined = useRef(false);
  useEffect(() => {
    if (!handed || joined.current) return;
    joined.current = true;
    dropHandedSnubber(revision.id);
    const list = design.snubbers ?? [];
    if (editable) edit({ design: { ...design, snubbers: [...list, { ...handed, name: `SN${list.length + 1}` }] } });
  }, [handed, revision.id, design, editable, edit]);

  return (
    // On a phone a frozen revision leads with its results: that is what a reader opens it for.
    <View style={[styles.columns, wide && styles.wide, !wide && !editable && styles.resultsFirst]} testID="design-tab">
      <View style={[styles.col, wide && styles.inputs]}>
        <Card title="Requirement (from the dossier)">
          <Text style={type.body}>
            At most {formatQuantity(revision.dossier.requirement.safeVoltage, 'V')} within {formatQuantity(revision.dossier.requirement.maxTime, 's')}
          </Text>
          {singleFaultText(revision.dossier.requirement) ? (
            <Text style={type.body} testID="revision-single-fault">
              {singleFaultText(revision.dossier.requirement)}
            </Text>
          ) : null}
          {revision.dossier.requirement.reference ? <Text style={type.small}>Worked to: {revision.dossier.requirement.reference}</Text> : null}
        </Card>
        <Text style={[type.small, saveProblem && styles.error]} testID="save-state">
          {saveWords(state, editable, revision.status)}
        </Text>
        {state.kind === 'conflict' ? (
          <EditConflict
            base={state.base}
            synced={state.synced}
            stored={state.stored}
            mine={content}
            onKeepMine={keepMine}
            onTakeStored={takeStored}
          />
        ) : null}
        {errors.length ? <Message tone="error" text="Some inputs were not accepted; see the marked fields." /> : null}
        {handed ? (
          <Message
            testID="rev-snubber-handed"
            tone={editable ? 'neutral' : 'error'}
            text={
              editable
                ? `✓ Added ${design.snubbers?.at(-1)?.name ?? 'the snubber'} from the sizing helper to the snubbers below; enter its ratings, tolerance and location.`
                : `Revision ${revision.number} is not a draft you may edit, so the sized snubber was not added.`
            }
          />
        ) : null}
        <DesignEditor value={design} readOnly={!editable} testIDPrefix="rev" serverErrors={errors} onChange={(next) => edit({ design: next })} />
        <Card title="Snubbers">
          <SnubberListEditor
            value={design.snubbers ?? []}
            readOnly={!editable}
            testIDPrefix="rev-snubbers"
            serverErrors={errors}
            onChange={(list) => edit({ design: { ...design, snubbers: list } })}
          />
        </Card>
        <Card title="Notes">
          <TextField
            label="Engineering notes (plain text or markdown)"
            testID="rev-notes"
            multiline
            editable={editable}
            value={notes}
            onChangeText={(text) => edit({ notes: text })}
          />
        </Card>
      </View>
      <View style={[styles.col, wide && styles.results]}>
        <ResultsPanel
          result={revision.results}
          requirement={revision.dossier.requirement}
          design={design}
          measured={measuredTraces(revision)}
          testIDPrefix="rev"
        />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  columns: { gap: space.lg },
  wide: { flexDirection: 'row', alignItems: 'flex-start' },
  resultsFirst: { flexDirection: 'column-reverse' },
  col: { gap: space.lg },
  inputs: { flex: 5 },
  results: { flex: 6 },
  error: { color: colors.fail },
});
