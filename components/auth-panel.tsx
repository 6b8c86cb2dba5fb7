import type { ReactNode } from 'react';
import { type Control, type FieldValues, type Path } from 'react-hook-form';
import { ScrollView, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, radius, space } from '../constants/theme';
import { FormTextField } from './ui/form-text-field';

/** The signed-out pages (sign-in, forgot password, choosing a password): one centred panel under the product name. */
export function AuthPanel({ testID, children, after }: { testID: string; children: ReactNode; after?: ReactNode }) {
  return (
    <ScrollView style={styles.page} contentContainerStyle={styles.center} keyboardShouldPersistTaps="handled">
      <View style={styles.panel} testID={testID}>
        <Text style={styles.brand}>Voltfall</Text>
        {children}
      </View>
      {after ? <View style={styles.after}>{after}</View> : null}
    </ScrollView>
  );
}

/** The account's e-mail address in a signed-out form. */
export function EmailField<T extends FieldValues>({
  control,
  name,
  testID,
  error,
  onSubmit,
}: {
  control: Control<T>;
  name: Path<T>;
  testID: string;
  error?: string;
  onSubmit?: () => void;
}) {
  return (
    <FormTextField
      control={control}
      name={name}
      label="E-mail"
      testID={testID}
      autoComplete="email"
      keyboardType="email-address"
      autoCapitalize="none"
      onSubmitEditing={onSubmit}
      error={error}
    />
  );
}

export const authStyles = StyleSheet.create({
  link: { fontFamily: fonts.semibold, color: colors.info, textDecorationLine: 'underline', alignSelf: 'flex-start' },
});

const styles = StyleSheet.create({
  page: { flex: 1, backgroundColor: colors.paper },
  center: { flexGrow: 1, alignItems: 'center', justifyContent: 'center', padding: space.lg, gap: space.lg },
  panel: {
    width: '100%',
    maxWidth: 420,
    backgroundColor: colors.surface,
    borderRadius: radius.lg,
    borderWidth: 1,
    borderColor: colors.line,
    padding: space.xl,
    gap: space.lg,
  },
  brand: { fontFamily: fonts.bold, fontSize: 28, color: colors.brand },
  after: { width: '100%', maxWidth: 420 },
});
