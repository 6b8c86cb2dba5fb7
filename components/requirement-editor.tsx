import { useState } from 'react';
import { Pressable, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, radius, space, type } from '../constants/theme';
import { PRESET_CAUTION, REQUIREMENT_PRESETS, type RequirementPreset } from '../constants/presets';
import { formLabel } from '../shared/design-fields';
import { REQUIREMENT_FIELDS, type FieldSpec } from '../shared/schema/fields';
import type { RequirementDraft } from '../shared/schema/discharge';
import { formatQuantity } from '../shared/units';
import { FieldGrid, type FieldProblem } from './design-editor';
import { Button } from './ui/button';
import { Card } from './ui/card';
import { Choice } from './ui/choice';
import { QuantityField } from './ui/quantity-field';
import { TextField } from './ui/text-field';

interface Props {
  value: RequirementDraft;
  onChange: (requirement: RequirementDraft) => void;
  readOnly?: boolean;
  /** Prefix of every testID inside, e.g. "requirement" → "requirement-safeVoltage". */
  testIDPrefix?: string;
  /** Problems reported for paths under "requirement."; shown on their fields. */
  serverErrors?: readonly FieldProblem[];
  /** Lists the typical requirements from the start, one tap from use (an empty requirement). */
  presetsOpen?: boolean;
}

type NumberKey = 'safeVoltage' | 'maxTime' | 'maxEnergy' | 'maxCharge' | 'fallbackMaxTime' | 'singleFaultMaxTime';

const FAULT_LIMIT = 'singleFaultMaxTime';

const FAULT_OPTIONS = [
  { value: 'normal', label: 'Normal condition only' },
  { value: 'single-fault', label: 'Also under a single fault' },
] as const;

/** The single-fault part of a requirement in one sentence, or null when it is not asked for. */
export function singleFaultText(requirement: Pick<RequirementDraft, 'singleFault' | 'singleFaultMaxTime' | 'maxTime'>): string | null {
  if (!requirement.singleFault) return null;
  const limit = requirement.singleFaultMaxTime ?? requirement.maxTime;
  return `Also under a single fault (one bleeder resistor open, one series resistor shorted)${limit != null ? `, within ${formatQuantity(limit, 's')}` : ''}.`;
}

/** The preset whose figures and reference text the requirement still carries, if any. */
function matchingPreset(value: RequirementDraft): RequirementPreset | undefined {
  const keys: Array<Exclude<NumberKey, typeof FAULT_LIMIT>> = ['safeVoltage', 'maxTime', 'maxEnergy', 'maxCharge', 'fallbackMaxTime'];
  return REQUIREMENT_PRESETS.find((p) => p.values.reference === value.reference && keys.every((k) => (p.values[k] ?? null) === (value[k] ?? null)));
}

/**
 * The limit a design must meet (docs/DOMAIN.md §7.1), entered by the user; presets are starting points and
 * say so.
 */
export function RequirementEditor({ value, onChange, readOnly, testIDPrefix = 'requirement', serverErrors = [], presetsOpen = false }: Props) {
  const [choosing, setChoosing] = useState(presetsOpen);
  const errorAt = (path: string) => serverErrors.find((e) => e.path === `requirement.${path}`)?.message;
  const preset = matchingPreset(value);
  const field = (spec: FieldSpec) => {
    const key = spec.path as NumberKey;
    return (
      <QuantityField
        key={spec.path}
        label={formLabel(spec)}
        kind={spec.kind}
        value={value[key]}
        onChange={(v) => onChange({ ...value, [key]: v })}
        testID={`${testIDPrefix}-${spec.path}`}
        placeholder={spec.placeholder}
        error={errorAt(spec.path)}
        readOnly={readOnly}
      />
    );
  };

  return (
    <Card title="Requirement" testID={testIDPrefix}>
      {!readOnly ? (
        <View style={styles.presets}>
          <Button
            label={choosing ? 'Hide typical requirements' : 'Start from a typical requirement…'}
            variant="secondary"
            testID={`${testIDPrefix}-presets-toggle`}
            onPress={() => setChoosing((c) => !c)}
          />
          {choosing ? (
            <View style={styles.presetList} accessibilityRole="list">
              <Text style={type.label}>Typical requirements — verify each before relying on it</Text>
              {REQUIREMENT_PRESETS.map((p) => (
                <Pressable
                  key={p.id}
                  testID={`${testIDPrefix}-preset-${p.id}`}
                  accessibilityRole="button"
                  style={({ pressed }) => [styles.preset, pressed && styles.presetPressed]}
                  onPress={() => {
                    onChange({ ...value, ...p.values });
                    setChoosing(false);
                  }}
                >
                  <Text style={styles.presetLabel}>{p.label}</Text>
                  <Text style={type.small}>{PRESET_CAUTION}</Text>
                </Pressable>
              ))}
            </View>
          ) : null}
        </View>
      ) : null}
      {preset ? (
        <View style={styles.note} testID={`${testIDPrefix}-preset-note`}>
          <Text style={[type.small, styles.noteText]}>
            ⚠ Figures of “{preset.label}”. {PRESET_CAUTION}. {preset.note}
          </Text>
        </View>
      ) : null}
      <FieldGrid>{REQUIREMENT_FIELDS.filter((spec) => spec.path !== FAULT_LIMIT).map(field)}</FieldGrid>
      <View style={styles.fault} testID={`${testIDPrefix}-fault`}>
        <Choice
          label="Condition the discharge must hold under (your standard decides)"
          testID={`${testIDPrefix}-singleFault`}
          options={FAULT_OPTIONS}
          value={value.singleFault ? 'single-fault' : 'normal'}
          disabled={readOnly}
          onChange={(v) => onChange({ ...value, singleFault: v === 'single-fault', ...(v === 'normal' ? { singleFaultMaxTime: null } : {}) })}
        />
        {value.singleFault ? (
          <>
            <Text style={type.small}>
              Adds the worst-case time with one bleeder resistor open (its string lost) and the stress on the others with one series resistor shorted.
              Not needed where the standard accepts the bleeder as a reliable component.
            </Text>
            <FieldGrid>{REQUIREMENT_FIELDS.filter((spec) => spec.path === FAULT_LIMIT).map(field)}</FieldGrid>
          </>
        ) : null}
      </View>
      <View style={styles.row}>
        <TextField
          label="Condition (when and where the limit applies)"
          testID={`${testIDPrefix}-condition`}
          value={value.condition ?? ''}
          onChangeText={(condition) => onChange({ ...value, condition })}
          placeholder="After mains disconnection, cover removable without a tool"
          multiline
          editable={!readOnly}
          error={errorAt('condition')}
        />
      </View>
      <View style={styles.row}>
        <TextField
          label="Reference (standard, edition and clause you work to)"
          testID={`${testIDPrefix}-reference`}
          value={value.reference ?? ''}
          onChangeText={(reference) => onChange({ ...value, reference })}
          placeholder="Standard, edition, clause"
          multiline
          editable={!readOnly}
          error={errorAt('reference')}
        />
      </View>
    </Card>
  );
}

const styles = StyleSheet.create({
  // A row so the text field's own flex basis sizes its width, not its height.
  row: { flexDirection: 'row' },
  fault: { gap: space.sm },
  presets: { gap: space.sm, alignItems: 'stretch' },
  presetList: { gap: space.xs },
  preset: { padding: space.md, borderRadius: radius.md, borderWidth: 1, borderColor: colors.line, backgroundColor: colors.surface, gap: 2 },
  presetPressed: { backgroundColor: colors.brandSoft },
  presetLabel: { fontFamily: fonts.semibold, fontSize: 15, color: colors.ink },
  note: { borderLeftWidth: 4, borderLeftColor: colors.accent, backgroundColor: colors.pendingSoft, padding: space.sm, borderRadius: radius.sm },
  noteText: { color: colors.ink },
});
