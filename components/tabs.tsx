import { Pressable, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, space } from '../constants/theme';

interface Props<T extends string> {
  tabs: ReadonlyArray<{ key: T; label: string }>;
  value: T;
  onChange: (key: T) => void;
  testID: string;
}

/** A row of section switches; the selected one is underlined and bold, not only coloured. */
export function Tabs<T extends string>({ tabs, value, onChange, testID }: Props<T>) {
  return (
    <View style={styles.row} role="tablist" testID={testID}>
      {tabs.map((t) => {
        const selected = t.key === value;
        return (
          <Pressable
            key={t.key}
            role="tab"
            aria-selected={selected}
            testID={`${testID}-${t.key}`}
            onPress={() => onChange(t.key)}
            style={[styles.tab, selected && styles.selected]}
          >
            <Text style={[styles.text, selected && styles.textSelected]}>{t.label}</Text>
          </Pressable>
        );
      })}
    </View>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', borderBottomWidth: 1, borderBottomColor: colors.line },
  tab: { flex: 1, alignItems: 'center', paddingVertical: space.md, borderBottomWidth: 3, borderBottomColor: 'transparent' },
  selected: { borderBottomColor: colors.brand },
  text: { fontFamily: fonts.medium, fontSize: 15, color: colors.inkMuted },
  textSelected: { fontFamily: fonts.bold, color: colors.brand },
});
