import { useState } from 'react';
import { Modal, ScrollView, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, radius, space, type } from '../constants/theme';
import type { Revision } from '../hooks/types';
import { Button } from './ui/button';
import { Message } from './ui/message';
import { TextField } from './ui/text-field';

interface Props {
  revision: Revision;
  signerName: string;
  signerRole: string;
  busy: boolean;
  /** The server's word on the password field (wrong or missing). */
  passwordError?: string;
  /** Any other refusal (for instance, another reviewer decided first). */
  error?: string;
  onSign: (password: string) => void;
  onCancel: () => void;
}

/** Approving is an electronic signature: the dialog states what the signature means and asks for the reviewer's password. */
export function ApprovalDialog({ revision, signerName, signerRole, busy, passwordError, error, onSign, onCancel }: Props) {
  const [password, setPassword] = useState('');
  const sign = () => onSign(password);
  return (
    <Modal transparent animationType="fade" onRequestClose={onCancel} visible>
      <View style={styles.scrim}>
        <ScrollView contentContainerStyle={styles.center} keyboardShouldPersistTaps="handled">
          <View style={styles.dialog} testID="approval-dialog" role="dialog" aria-modal aria-label="Sign the approval">
            <Text style={type.title}>Sign the approval</Text>
            <View style={styles.statement}>
              <Text style={styles.statementText} testID="approval-meaning">
                I approve revision {revision.number} of “{revision.dossier.title}” ({revision.dossier.product.name}) as {signerRole}.
              </Text>
            </View>
            <Text style={type.small}>
              You sign as {signerName}. Your password makes this your signature: the record keeps your name, role, this meaning and the time, and the
              signed dossier is issued with it.
            </Text>
            {revision.contentHash ? <Text style={[type.mono, styles.hash]}>Content hash {revision.contentHash}</Text> : null}
            <TextField
              label="Your password"
              testID="approve-password"
              secureTextEntry
              autoComplete="current-password"
              autoFocus
              value={password}
              onChangeText={setPassword}
              onSubmitEditing={sign}
              error={passwordError}
            />
            {error ? <Message tone="error" text={error} testID="approval-error" /> : null}
            <View style={styles.actions}>
              <Button label="Sign and approve" testID="approve-confirm" busy={busy} onPress={sign} />
              <Button label="Cancel" variant="secondary" testID="approve-cancel" disabled={busy} onPress={onCancel} />
            </View>
          </View>
        </ScrollView>
      </View>
    </Modal>
  );
}

const styles = StyleSheet.create({
  scrim: { flex: 1, backgroundColor: colors.scrim },
  center: { flexGrow: 1, alignItems: 'center', justifyContent: 'center', padding: space.lg },
  dialog: {
    width: '100%',
    maxWidth: 520,
    backgroundColor: colors.surface,
    borderRadius: radius.lg,
    padding: space.xl,
    gap: space.lg,
    borderWidth: 1,
    borderColor: colors.line,
  },
  statement: { borderLeftWidth: 4, borderLeftColor: colors.brand, backgroundColor: colors.brandSoft, padding: space.md, borderRadius: radius.sm },
  statementText: { fontFamily: fonts.semibold, fontSize: 16, lineHeight: 22, color: colors.ink },
  hash: { fontSize: 11, color: colors.inkMuted },
  actions: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
});
