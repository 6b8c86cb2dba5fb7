import { useState, type ReactNode } from 'react';
import { StyleSheet, Text, View, type LayoutChangeEvent } from 'react-native';
import { colors, radius, space, type } from '../constants/theme';
import { formLabel, getPath } from '../shared/design-fields';
import { ACTIVE_FIELDS, DESIGN_GROUPS, type FieldKind, type FieldSpec } from '../shared/schema/fields';
import { busFromMains } from '../shared/engine';
import type { DesignDraft } from '../shared/schema/discharge';
import { formatQuantity } from '../shared/units';
import { Button } from './ui/button';
import { Card } from './ui/card';
import { Choice } from './ui/choice';
import { Message } from './ui/message';
import { QuantityField } from './ui/quantity-field';

export interface FieldProblem {
  /** Dotted path from the API, e.g. "design.bleeder.resistance". */
  path: string;
  message: string;
}

interface Props {
  value: DesignDraft;
  onChange: (design: DesignDraft) => void;
  readOnly?: boolean;
  /** Prefix of every testID inside, e.g. "design" → "design-bleeder-resistance". */
  testIDPrefix?: string;
  /** Problems reported for paths under "design." (by the server or the schema); shown on their fields. */
  serverErrors?: readonly FieldProblem[];
}

type ActiveMode = 'none' | 'constant-current' | 'switched-resistor';

const ACTIVE_OPTIONS: ReadonlyArray<{ value: ActiveMode; label: string }> = [
  { value: 'none', label: 'None' },
  { value: 'constant-current', label: 'Constant current' },
  { value: 'switched-resistor', label: 'Switched resistor' },
];

/** Groups left out altogether (null) when every field in them is empty, rather than half-filled. */
const OPTIONAL_GROUPS = new Set(['balancing']);

type Tree = { [key: string]: unknown };
const isTree = (v: unknown): v is Tree => typeof v === 'object' && v !== null && !Array.isArray(v);

/** A copy of `root` with `value` at the dotted `path`; missing objects on the way are created. */
function setPath(root: Tree, path: readonly string[], value: unknown): Tree {
  const [key, ...rest] = path;
  if (rest.length === 0) return { ...root, [key]: value };
  const child = root[key];
  return { ...root, [key]: setPath(isTree(child) ? child : {}, rest, value) };
}

function withField(design: DesignDraft, path: string, value: number | null): DesignDraft {
  const [group] = path.split('.');
  let next = setPath(design as Tree, path.split('.'), value);
  const groupValue = next[group];
  if (OPTIONAL_GROUPS.has(group) && isTree(groupValue) && Object.values(groupValue).every((v) => v === null || v === undefined)) {
    next = { ...next, [group]: null };
  }
  // The tree keeps the draft's shape: only one leaf number (or an emptied optional group) changed.
  return next as DesignDraft;
}

function withActiveMode(design: DesignDraft, mode: ActiveMode): DesignDraft {
  if (mode === 'none') return { ...design, active: null };
  if (design.active?.mode === mode) return design;
  const delay = design.active?.delay ?? null;
  return {
    ...design,
    active: mode === 'constant-current' ? { mode, current: null, delay } : { mode, resistance: null, pulseEnergy: null, powerRating: null, delay },
  };
}

function numberAt(design: DesignDraft, path: string): number | null {
  const v = getPath(design, path);
  return typeof v === 'number' ? v : null;
}

const idOf = (prefix: string, path: string) => `${prefix}-${path.replace(/\./g, '-')}`;

/**
 * Design inputs of a discharge network (docs/DOMAIN.md §7.2), one compact card per group. Each field keeps
 * its own text; the draft receives SI numbers, null for empty or unreadable text. `design.snubbers` is
 * passed through untouched.
 */
export function DesignEditor({ value, onChange, readOnly, testIDPrefix = 'design', serverErrors = [] }: Props) {
  const errorAt = (path: string) => serverErrors.find((e) => e.path === `design.${path}`)?.message;
  const knownPaths = new Set([
    ...DESIGN_GROUPS.flatMap((g) => [g.key, ...g.fields.map((f) => f.path)]),
    'active',
    'active.mode',
    ...Object.values(ACTIVE_FIELDS).flatMap((fields) => fields.map((f) => f.path)),
  ]);
  const elsewhere = serverErrors.filter((e) => {
    const inner = e.path.replace(/^design\.?/, '');
    return !knownPaths.has(inner) && !inner.startsWith('snubbers');
  });
  const mode: ActiveMode = value.active?.mode ?? 'none';

  const field = (spec: FieldSpec, keyPrefix = '') => (
    <QuantityField
      key={`${keyPrefix}${spec.path}`}
      label={formLabel(spec)}
      kind={spec.kind}
      value={numberAt(value, spec.path)}
      onChange={(v) => onChange(withField(value, spec.path, v))}
      testID={idOf(testIDPrefix, spec.path)}
      placeholder={spec.placeholder}
      error={errorAt(spec.path)}
      readOnly={readOnly}
    />
  );

  return (
    <View style={styles.wrap} testID={testIDPrefix}>
      {elsewhere.length > 0 ? (
        <Message tone="error" text={elsewhere.map((e) => `${e.path}: ${e.message}`).join(' · ')} testID={`${testIDPrefix}-other-errors`} />
      ) : null}
      {DESIGN_GROUPS.map((group) => (
        <Card key={group.key} title={formLabel(group)} testID={`${testIDPrefix}-group-${group.key}`}>
          {errorAt(group.key) ? <Message tone="error" text={errorAt(group.key) ?? ''} /> : null}
          <FieldGrid>{group.fields.map((spec) => field(spec))}</FieldGrid>
          {group.key === 'bus' && !readOnly ? (
            <MainsHelper testIDPrefix={testIDPrefix} onUse={(v) => onChange(withField(value, 'bus.maxVoltage', v))} />
          ) : null}
        </Card>
      ))}
      <Card title="Active discharge" testID={`${testIDPrefix}-group-active`}>
        <Choice
          label="Circuit"
          testID={`${testIDPrefix}-active-mode`}
          options={ACTIVE_OPTIONS}
          value={mode}
          readOnly={readOnly}
          onChange={(m) => onChange(withActiveMode(value, m))}
        />
        {errorAt('active') ? <Message tone="error" text={errorAt('active') ?? ''} /> : null}
        {mode === 'none' ? (
          <Text style={type.small}>The bleeder network alone discharges the bank.</Text>
        ) : (
          <>
            <Text style={type.small}>
              The active circuit sets the discharge time; the bleeders alone are checked against the bleeder-only time limit.
            </Text>
            <FieldGrid>{ACTIVE_FIELDS[mode].map((spec) => field(spec, mode))}</FieldGrid>
          </>
        )}
      </Card>
    </View>
  );
}

/** Fields in two columns when there is room for two, else one. */
export function FieldGrid({ children }: { children: ReactNode[] }) {
  const [width, setWidth] = useState(0);
  const onLayout = (e: LayoutChangeEvent) => setWidth(e.nativeEvent.layout.width);
  const columns = width >= 2 * MIN_FIELD_WIDTH + space.md ? 2 : 1;
  const cellWidth = columns === 2 ? (width - space.md) / 2 : undefined;
  return (
    <View style={styles.grid} onLayout={onLayout}>
      {children.map((child, i) => (
        <View key={i} style={[styles.cell, cellWidth === undefined ? styles.cellFull : { width: cellWidth }]}>
          {child}
        </View>
      ))}
    </View>
  );
}

const MIN_FIELD_WIDTH = 200;

const MAINS_RMS: FieldKind = { type: 'quantity', unit: 'V', supply: 'ac' };
const MAINS_TOLERANCE: FieldKind = { type: 'percent' };

/** Four significant digits, rounded up so the maximum bus is never understated. */
function roundUp(value: number): number {
  const step = 10 ** (Math.floor(Math.log10(value)) - 3);
  return Number((Math.ceil(value / step - 1e-9) * step).toPrecision(4));
}

/** Maximum bus from AC mains: rectified peak √2 · V_rms · (1 + tolerance). */
function MainsHelper({ testIDPrefix, onUse }: { testIDPrefix: string; onUse: (v: number) => void }) {
  const [open, setOpen] = useState(false);
  const [rms, setRms] = useState<number | null>(400);
  const [tolerance, setTolerance] = useState<number | null>(0.1);
  const peak = rms !== null && tolerance !== null ? roundUp(busFromMains(rms, tolerance)) : null;
  if (!open) {
    return (
      <View style={styles.helperToggle}>
        <Button label="Maximum bus from AC mains…" variant="quiet" testID={`${testIDPrefix}-mains-open`} onPress={() => setOpen(true)} />
      </View>
    );
  }
  return (
    <View style={styles.helper} testID={`${testIDPrefix}-mains`}>
      <Text style={type.label}>Maximum bus from AC mains: peak = √2 × V rms × (1 + tolerance)</Text>
      <FieldGrid>
        {[
          <QuantityField
            key="rms"
            label="Mains voltage (RMS)"
            kind={MAINS_RMS}
            value={rms}
            onChange={setRms}
            testID={`${testIDPrefix}-mains-rms`}
            placeholder="400 V"
          />,
          <QuantityField
            key="tol"
            label="Upper mains tolerance"
            kind={MAINS_TOLERANCE}
            value={tolerance}
            onChange={setTolerance}
            testID={`${testIDPrefix}-mains-tolerance`}
            placeholder="10 %"
          />,
        ]}
      </FieldGrid>
      <View style={styles.helperActions}>
        <Button
          label={peak === null ? 'Enter mains voltage and tolerance' : `Use ${formatQuantity(peak, 'V', 4)} as maximum bus`}
          variant="secondary"
          disabled={peak === null}
          testID={`${testIDPrefix}-mains-use`}
          onPress={() => {
            if (peak !== null) onUse(peak);
            setOpen(false);
          }}
        />
        <Button label="Close" variant="quiet" testID={`${testIDPrefix}-mains-close`} onPress={() => setOpen(false)} />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: space.md },
  grid: { flexDirection: 'row', flexWrap: 'wrap', columnGap: space.md, rowGap: space.sm },
  // A row so the field's own flex basis sizes its width, not its height.
  cell: { flexDirection: 'row' },
  cellFull: { width: '100%' },
  helperToggle: { alignSelf: 'flex-start' },
  helper: { gap: space.sm, padding: space.md, borderRadius: radius.md, borderWidth: 1, borderColor: colors.line, backgroundColor: colors.paper },
  helperActions: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
});
