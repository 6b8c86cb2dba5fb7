import { Modal, Pressable, StyleSheet, Text, View } from 'react-native';
import { colors, radius, space, type } from '../../constants/theme';
import { Button } from './button';
import { Message } from './message';

interface Props {
  /** Shown while true; the caller closes it on cancel and after the change succeeded. */
  visible: boolean;
  title: string;
  /** What will happen, in plain sentences, before anything does. */
  consequences: readonly string[];
  confirmLabel: string;
  /** "danger" for what cannot be undone from here (removing, disabling). */
  tone?: 'primary' | 'danger';
  busy?: boolean;
  /** Why the change did not happen, when it failed; the dialog stays open to say so. */
  error?: string | null;
  onConfirm: () => void;
  onCancel: () => void;
  testID: string;
}

/** Asks before a change that matters: says what will happen, offers Cancel first, and reports a failure in place. */
export function ConfirmDialog({ visible, title, consequences, confirmLabel, tone = 'primary', busy, error, onConfirm, onCancel, testID }: Props) {
  return (
    <Modal visible={visible} transparent animationType="none" onRequestClose={onCancel}>
      <View style={styles.backdrop}>
        {/* A tap beside the dialog cancels, as Escape does. */}
        <Pressable style={StyleSheet.absoluteFill} onPress={onCancel} accessibilityLabel="Cancel" testID={`${testID}-backdrop`} />
        <View style={styles.dialog} role="dialog" aria-modal aria-label={title} testID={testID}>
          <Text style={type.heading} accessibilityRole="header">
            {title}
          </Text>
          {consequences.map((line) => (
            <Text key={line} style={type.body}>
              {line}
            </Text>
          ))}
          {error ? <Message tone="error" text={error} testID={`${testID}-error`} /> : null}
          <View style={styles.actions}>
            <Button label="Cancel" variant="secondary" testID={`${testID}-cancel`} onPress={onCancel} disabled={busy} />
            <Button label={confirmLabel} variant={tone} testID={`${testID}-confirm`} onPress={onConfirm} busy={busy} />
          </View>
        </View>
      </View>
    </Modal>
  );
}

const styles = StyleSheet.create({
  backdrop: { flex: 1, alignItems: 'center', justifyContent: 'center', padding: space.lg, backgroundColor: colors.scrim },
  dialog: {
    width: '100%',
    maxWidth: 480,
    gap: space.md,
    padding: space.xl,
    borderRadius: radius.lg,
    backgroundColor: colors.surface,
    borderWidth: 1,
    borderColor: colors.line,
  },
  actions: { flexDirection: 'row', flexWrap: 'wrap', justifyContent: 'flex-end', gap: space.sm, paddingTop: space.sm },
});
