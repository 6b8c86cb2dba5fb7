import { useRef } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, radius, space, type } from '../constants/theme';
import { snubberChecks } from '../shared/engine/snubber';
import type { Check } from '../shared/schema/discharge';
import {
  SNUBBER_FIELDS,
  SNUBBER_KIND_KEYS,
  SNUBBER_KIND_WORDS,
  SNUBBER_OTHER_FIELDS,
  snubberFieldsOf,
  snubberFieldWords,
  snubberValue,
  type SnubberFieldSpec,
} from '../shared/schema/fields';
import { snubberSchema, type SnubberDraft, type SnubberKind } from '../shared/schema/snubber';
import { CheckCard } from './check-card';
import { Badge } from './ui/badge';
import { Button } from './ui/button';
import { Choice } from './ui/choice';
import { Message } from './ui/message';
import { QuantityField } from './ui/quantity-field';
import { TextField } from './ui/text-field';

interface SnubberFieldProblem {
  /** Dotted path from the API, e.g. "design.snubbers.0.resistance". */
  path: string;
  message: string;
}

interface Props {
  value: readonly SnubberDraft[];
  onChange: (list: SnubberDraft[]) => void;
  readOnly?: boolean;
  /** Prefix of every testID inside, e.g. "snubbers" → "snubbers-0-resistance". */
  testIDPrefix?: string;
  /** Problems reported for paths containing "snubbers.<index>."; shown on their fields. */
  serverErrors?: readonly SnubberFieldProblem[];
}

const KIND_NOTES: Record<SnubberKind, string> = {
  rc: 'Loop parasitics for the damping check, e.g. from the snubber sizing helper; C_par may stay empty.',
  'rcd-turnoff': 'For the capacitor size and the reset time.',
  'rcd-clamp': 'Leakage data give the settled clamp voltage; without them, enter the clamp voltage.',
};
const KIND_OPTIONS: ReadonlyArray<{ value: SnubberKind; label: string }> = SNUBBER_KIND_KEYS.map((value) => ({
  value,
  label: SNUBBER_KIND_WORDS[value],
}));

const YES_NO: ReadonlyArray<{ value: 'yes' | 'no'; label: string }> = [
  { value: 'no', label: 'No' },
  { value: 'yes', label: 'Yes' },
];

/** The fields only some kinds have. */
const KIND_ONLY = new Set<string>(SNUBBER_FIELDS.filter((f) => f.group === 'kind').map((f) => f.key));

function withKind(draft: SnubberDraft, kind: SnubberKind): SnubberDraft {
  if (draft.kind === kind) return draft;
  // The extras of the old kind would be rejected by the new kind's schema, so they go.
  const keep = Object.fromEntries(Object.entries(draft).filter(([k]) => !KIND_ONLY.has(k)));
  return { ...keep, kind };
}

const newSnubber = (index: number): SnubberDraft => ({ kind: 'rc', name: `SN${index + 1}`, location: '', accessible: false });

type Evaluation = { state: 'checked'; checks: Check[] } | { state: 'incomplete'; missing: string[]; problems: Record<string, string> };

/** The engine's checks when the draft is a whole snubber; otherwise what is missing and what is wrong. */
function evaluate(draft: SnubberDraft): Evaluation {
  const parsed = snubberSchema.safeParse(draft);
  if (parsed.success) return { state: 'checked', checks: snubberChecks(parsed.data) };
  const missing: string[] = [];
  const problems: Record<string, string> = {};
  for (const issue of parsed.error.issues) {
    const key = String(issue.path[0] ?? '');
    const present = (draft as Record<string, unknown>)[key];
    if (present === undefined || present === null || present === '') missing.push(snubberFieldWords(key)?.label ?? key);
    else problems[key] ??= issue.message;
  }
  return { state: 'incomplete', missing: [...new Set(missing)], problems };
}

/** Server problems for snubber `index`, by field name; "" holds those for the snubber as a whole. */
function problemsAt(errors: readonly SnubberFieldProblem[], index: number): Record<string, string> {
  const out: Record<string, string> = {};
  for (const e of errors) {
    const m = /(?:^|\.)snubbers\.(\d+)(?:\.(\w+))?/.exec(e.path);
    if (m && Number(m[1]) === index) out[m[2] ?? ''] ??= e.message;
  }
  return out;
}

/**
 * The switching snubbers of a design: add and remove them, enter each one's parts and operating point,
 * and see its dissipation, voltage and damping (or reset) checks as they are typed. The revision's
 * results from the server remain the record; these are the same engine's checks, live.
 */
export function SnubberListEditor({ value, onChange, readOnly, testIDPrefix = 'snubbers', serverErrors = [] }: Props) {
  // Stable keys, so removing one snubber does not hand its typed text to the next.
  const ids = useRef<number[]>([]);
  const nextId = useRef(0);
  while (ids.current.length < value.length) ids.current.push(nextId.current++);
  if (ids.current.length > value.length) ids.current = ids.current.slice(0, value.length);

  const listProblems = serverErrors.filter((e) => /(?:^|\.)snubbers$/.test(e.path)).map((e) => e.message);

  const update = (index: number, next: SnubberDraft) => onChange(value.map((s, i) => (i === index ? next : s)));
  const remove = (index: number) => {
    ids.current = ids.current.filter((_, i) => i !== index);
    onChange(value.filter((_, i) => i !== index));
  };
  const add = () => {
    ids.current = [...ids.current, nextId.current++];
    onChange([...value, newSnubber(value.length)]);
  };

  return (
    <View style={styles.list} testID={testIDPrefix}>
      {value.length === 0 ? (
        <Text style={type.body} testID={`${testIDPrefix}-empty`}>
          {readOnly ? 'No snubbers in this design.' : 'No snubbers yet. Add one for each RC or RCD network whose parts a reviewer should check.'}
        </Text>
      ) : null}
      {listProblems.map((message) => (
        <Message key={message} tone="error" text={message} />
      ))}
      {value.map((draft, index) => (
        <SnubberEntry
          key={ids.current[index]}
          draft={draft}
          index={index}
          readOnly={readOnly}
          testID={`${testIDPrefix}-${index}`}
          serverProblems={problemsAt(serverErrors, index)}
          onChange={(next) => update(index, next)}
          onRemove={() => remove(index)}
        />
      ))}
      {readOnly ? null : (
        <View style={styles.addRow}>
          <Button label="Add a snubber" variant="secondary" testID={`${testIDPrefix}-add`} onPress={add} />
        </View>
      )}
    </View>
  );
}

interface EntryProps {
  draft: SnubberDraft;
  index: number;
  readOnly?: boolean;
  testID: string;
  serverProblems: Record<string, string>;
  onChange: (next: SnubberDraft) => void;
  onRemove: () => void;
}

function SnubberEntry({ draft, index, readOnly, testID, serverProblems, onChange, onRemove }: EntryProps) {
  const evaluation = evaluate(draft);
  const localProblems = evaluation.state === 'incomplete' ? evaluation.problems : {};
  const isEmpty = (key: string) => {
    const v = (draft as Record<string, unknown>)[key];
    return v === undefined || v === null || (typeof v === 'string' && v.trim() === '');
  };
  // What the schema says now beats what the server said at the last save. An empty field's refusal is
  // not repeated under each field: the list of missing inputs below says it once.
  const problemOf = (key: string) => localProblems[key] ?? (isEmpty(key) ? undefined : serverProblems[key]);
  const refusedEmpty = Object.keys(serverProblems).some((key) => key !== '' && isEmpty(key));

  const numeric = (spec: SnubberFieldSpec) => (
    <QuantityField
      key={spec.key}
      label={spec.label}
      kind={spec.kind}
      value={snubberValue(draft, spec.key)}
      onChange={(v) => onChange({ ...draft, [spec.key]: v })}
      testID={`${testID}-${spec.key}`}
      placeholder={spec.placeholder}
      error={problemOf(spec.key)}
      readOnly={readOnly}
    />
  );

  const title = draft.name?.trim() ? draft.name.trim() : `Snubber ${index + 1}`;

  return (
    <View style={styles.entry} testID={testID}>
      <View style={styles.entryHead}>
        <Text style={[type.heading, styles.entryTitle]}>{title}</Text>
        <Verdict evaluation={evaluation} testID={`${testID}-status`} />
      </View>
      {serverProblems[''] ? <Message tone="error" text={serverProblems['']} /> : null}
      <View style={styles.row}>
        <TextField
          label={SNUBBER_OTHER_FIELDS.name.label}
          testID={`${testID}-name`}
          value={draft.name ?? ''}
          editable={!readOnly}
          placeholder="SN1"
          onChangeText={(name) => onChange({ ...draft, name })}
          error={problemOf('name')}
        />
      </View>
      <View style={styles.row}>
        <TextField
          label={SNUBBER_OTHER_FIELDS.location.prompt}
          testID={`${testID}-location`}
          value={draft.location ?? ''}
          editable={!readOnly}
          placeholder="across Q3 drain–source"
          onChangeText={(location) => onChange({ ...draft, location })}
          error={problemOf('location')}
        />
      </View>
      <Choice
        label={SNUBBER_OTHER_FIELDS.kind.label}
        testID={`${testID}-kind`}
        options={KIND_OPTIONS}
        value={draft.kind}
        readOnly={readOnly}
        onChange={(kind) => onChange(withKind(draft, kind))}
      />

      <Text style={styles.group}>Parts and ratings</Text>
      <View style={styles.row}>{snubberFieldsOf(draft.kind, 'parts').map(numeric)}</View>
      <Text style={styles.group}>Operating point</Text>
      <View style={styles.row}>{snubberFieldsOf(draft.kind, 'operating').map(numeric)}</View>
      <Text style={styles.group}>{SNUBBER_KIND_WORDS[draft.kind]} details</Text>
      <Text style={type.small}>{KIND_NOTES[draft.kind]}</Text>
      <View style={styles.row}>{snubberFieldsOf(draft.kind, 'kind').map(numeric)}</View>
      <Choice
        label={SNUBBER_OTHER_FIELDS.accessible.prompt}
        testID={`${testID}-accessible`}
        options={YES_NO}
        value={draft.accessible ? 'yes' : 'no'}
        readOnly={readOnly}
        onChange={(v) => onChange({ ...draft, accessible: v === 'yes' })}
      />

      <Text style={styles.group}>Checks</Text>
      {evaluation.state === 'checked' ? (
        <View style={styles.checks}>
          {evaluation.checks.map((check) =>
            check.value === null ? (
              <UndecidedCheck key={check.id} check={check} testID={`${testID}-check-${check.id}`} />
            ) : (
              <CheckCard key={check.id} check={check} testID={`${testID}-check-${check.id}`} />
            ),
          )}
        </View>
      ) : refusedEmpty && evaluation.missing.length ? (
        <Message
          tone="error"
          testID={`${testID}-checks-pending`}
          text={`Not accepted until these are filled in: ${evaluation.missing.join(', ')}.`}
        />
      ) : (
        <Text style={type.small} testID={`${testID}-checks-pending`}>
          {evaluation.missing.length
            ? `Checks appear once these are filled in: ${evaluation.missing.join(', ')}.`
            : 'Checks appear once the marked fields are corrected.'}
        </Text>
      )}
      {readOnly ? null : (
        <View style={styles.removeRow}>
          <Button label={`Remove ${title}`} variant="quiet" testID={`${testID}-remove`} onPress={onRemove} />
        </View>
      )}
    </View>
  );
}

function Verdict({ evaluation, testID }: { evaluation: Evaluation; testID: string }) {
  if (evaluation.state === 'incomplete') return <Badge label="Incomplete" tone="pending" testID={testID} />;
  const undecided = evaluation.checks.filter((c) => c.value === null).length;
  const failed = evaluation.checks.filter((c) => c.value !== null && !c.pass).length;
  if (failed > 0) return <Badge label={failed === 1 ? '1 check fails' : `${failed} checks fail`} tone="fail" testID={testID} />;
  if (undecided === evaluation.checks.length) return <Badge label="Not decided" tone="pending" testID={testID} />;
  if (undecided > 0) return <Badge label={`Passes so far, ${undecided} not decided`} tone="pending" testID={testID} />;
  return <Badge label="All checks pass" tone="pass" testID={testID} />;
}

/** A check the engine could not decide because an optional input is missing; its detail names the input. */
function UndecidedCheck({ check, testID }: { check: Check; testID: string }) {
  return (
    <View style={styles.undecided} testID={testID} accessibilityLabel={`${check.label}: not decided`}>
      <View style={styles.entryHead}>
        <Text style={[type.heading, styles.entryTitle]}>{check.label}</Text>
        <Badge label="Not decided" tone="pending" testID={`${testID}-status`} />
      </View>
      <Text style={type.small} testID={`${testID}-detail`}>
        {check.detail}
      </Text>
    </View>
  );
}

const styles = StyleSheet.create({
  list: { gap: space.lg },
  entry: { gap: space.md, paddingTop: space.md, borderTopWidth: 1, borderTopColor: colors.line },
  entryHead: { flexDirection: 'row', justifyContent: 'space-between', alignItems: 'flex-start', gap: space.sm, flexWrap: 'wrap' },
  entryTitle: { flexShrink: 1 },
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  group: { ...type.label, color: colors.ink, textTransform: 'uppercase', letterSpacing: 0.4, paddingTop: space.xs },
  checks: { gap: space.sm },
  undecided: {
    gap: space.xs,
    padding: space.md,
    borderRadius: radius.md,
    borderWidth: 1,
    borderStyle: 'dashed',
    borderColor: colors.pending,
    backgroundColor: colors.surface,
  },
  addRow: { alignSelf: 'flex-start' },
  removeRow: { alignSelf: 'flex-start' },
});
