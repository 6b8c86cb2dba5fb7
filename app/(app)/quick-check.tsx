import { useMemo } from 'react';
import { Controller, useForm, useWatch } from 'react-hook-form';
import { Platform, StyleSheet, Text, useWindowDimensions, View, type ViewStyle } from 'react-native';
import { z } from 'zod';
import { DesignEditor, type FieldProblem } from '../../components/design-editor';
import { RequirementEditor } from '../../components/requirement-editor';
import { ResultsPanel, VerdictStrip } from '../../components/results-panel';
import { Button } from '../../components/ui/button';
import { Message } from '../../components/ui/message';
import { Screen } from '../../components/ui/screen';
import { EXAMPLE_DESIGN, EXAMPLE_REQUIREMENT } from '../../constants/presets';
import { colors, space, type, WIDE_BREAKPOINT } from '../../constants/theme';
import { useCalc } from '../../hooks/use-calc';
import { designDraftSchema, requirementDraftSchema } from '../../shared/schema/discharge';

// The drafts the server validates: unfinished is fine, but what is present must make sense. Snubbers
// have no place on this screen, so the form leaves them out.
const quickCheckSchema = z.object({ requirement: requirementDraftSchema, design: designDraftSchema.omit({ snubbers: true }) });
type QuickCheckForm = z.infer<typeof quickCheckSchema>;

const EXAMPLE: QuickCheckForm = { requirement: EXAMPLE_REQUIREMENT, design: EXAMPLE_DESIGN };

/** Problems with what is present, as "design.bus.maxVoltage" paths; missing inputs are the result's business. */
function problemsOf(values: QuickCheckForm): FieldProblem[] {
  const parsed = quickCheckSchema.safeParse(values);
  return parsed.success ? [] : parsed.error.issues.map((issue) => ({ path: issue.path.join('.'), message: issue.message }));
}

export default function QuickCheckScreen() {
  const wide = useWindowDimensions().width >= WIDE_BREAKPOINT;
  // The form holds the drafts; the schema is checked on every change (not only on submit, which this
  // screen has none of) so a value out of range is flagged while it is typed.
  const { control, reset } = useForm<QuickCheckForm>({ defaultValues: EXAMPLE });
  const values = useWatch({ control }) as QuickCheckForm;
  const calc = useCalc(values);
  const local = useMemo(() => problemsOf(values), [values]);
  const problems = [...local, ...calc.fieldErrors];

  return (
    <Screen
      title="Quick check"
      subtitle="Discharge checks without a dossier. Results update as you type."
      testID="quick-check-screen"
      actions={<Button label="Reset to the example" variant="secondary" testID="quick-check-reset" onPress={() => reset(EXAMPLE)} />}
    >
      <View style={[styles.stickyTop, stickyOnWeb]}>
        <VerdictStrip result={calc.result} testID="quick-check-strip" />
      </View>
      <View style={[styles.columns, wide && styles.columnsWide]}>
        <View style={[styles.column, wide && styles.columnWide]}>
          <Controller
            control={control}
            name="requirement"
            render={({ field }) => <RequirementEditor value={field.value} onChange={field.onChange} serverErrors={problems} />}
          />
          <Controller
            control={control}
            name="design"
            render={({ field }) => <DesignEditor value={field.value} onChange={field.onChange} serverErrors={problems} />}
          />
        </View>
        <View style={[styles.column, wide && styles.columnWide]} testID="quick-check-results">
          <Text style={type.small} testID="quick-check-source">
            {calc.source === 'server'
              ? calc.working
                ? '◷ Checked by the server; re-checking…'
                : '✓ Checked by the server'
              : calc.source === 'preview'
                ? '◷ Preview computed in the browser; waiting for the server…'
                : '◷ Not sent to the server until the inputs are complete and in range'}
          </Text>
          {calc.error ? <Message tone="error" text={calc.error.message} testID="quick-check-error" /> : null}
          <ResultsPanel result={calc.result} requirement={values.requirement} design={values.design} />
        </View>
      </View>
    </Screen>
  );
}

// react-native-web hands CSS `position: sticky` to the browser, so the verdict stays in view while the
// inputs are scrolled; React Native's style types do not list the value.
const stickyOnWeb = Platform.OS === 'web' ? ({ position: 'sticky', top: 0 } as unknown as ViewStyle) : null;

const styles = StyleSheet.create({
  stickyTop: { zIndex: 2, backgroundColor: colors.paper, paddingVertical: space.xs },
  columns: { gap: space.lg },
  columnsWide: { flexDirection: 'row', alignItems: 'flex-start' },
  column: { gap: space.md },
  columnWide: { flex: 1, flexBasis: 0, minWidth: 0 },
});
