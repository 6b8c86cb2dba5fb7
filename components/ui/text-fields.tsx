import type { ReactNode } from 'react';
import { StyleSheet, View } from 'react-native';
import { space } from '../../constants/theme';
import { TextField } from './text-field';

/** One text field of a form, described once; the form supplies the values. */
export interface TextFieldSpec<K extends string> {
  key: K;
  label: string;
  testID: string;
  placeholder?: string;
  hint?: string;
}

interface Props<K extends string> {
  fields: ReadonlyArray<TextFieldSpec<K>>;
  value: Readonly<Record<K, string>>;
  onChange: (next: Record<K, string>) => void;
  /** The problem to show under a field, if any. */
  errorOf?: (key: K) => string | undefined;
  /** Further fields in the same row, after these. */
  children?: ReactNode;
}

/** A row of text fields (wrapping on a narrow screen), one per spec, editing one record of texts. */
export function TextFields<K extends string>({ fields, value, onChange, errorOf, children }: Props<K>) {
  return (
    <View style={styles.row}>
      {fields.map((field) => (
        <TextField
          key={field.key}
          label={field.label}
          testID={field.testID}
          placeholder={field.placeholder}
          hint={field.hint}
          value={value[field.key]}
          onChangeText={(text) => onChange({ ...value, [field.key]: text })}
          error={errorOf?.(field.key)}
        />
      ))}
      {children}
    </View>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
});
