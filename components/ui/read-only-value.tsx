import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, space, type } from '../../constants/theme';

interface Props {
  label: string;
  /** The value as recorded; an empty one reads "—". */
  value: string;
  testID: string;
}

/** A recorded value of a frozen revision: its label and the value as text, with nothing to type into. */
export function ReadOnlyValue({ label, value, testID }: Props) {
  const shown = value.trim() === '' ? '—' : value;
  return (
    <View style={styles.wrap}>
      <Text style={type.label} nativeID={`${testID}-label`}>
        {label}
      </Text>
      <Text testID={testID} style={styles.value} selectable aria-labelledby={`${testID}-label`} aria-readonly>
        {shown}
      </Text>
    </View>
  );
}

const styles = StyleSheet.create({
  // Sized like a text field so a frozen form keeps the layout of the editable one.
  wrap: {
    gap: 2,
    flexGrow: 1,
    flexShrink: 1,
    minWidth: 140,
    maxWidth: '100%',
    paddingBottom: space.xs,
    borderBottomWidth: 1,
    borderBottomColor: colors.line,
  },
  value: { fontFamily: fonts.medium, fontSize: 16, lineHeight: 22, color: colors.ink },
});
