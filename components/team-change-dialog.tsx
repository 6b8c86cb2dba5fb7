import type { Role } from '../hooks/use-me';
import type { TeamMember } from '../hooks/use-team';
import { ConfirmDialog } from './ui/confirm-dialog';

/** A change to someone's account waiting for the admin's confirmation. */
export type TeamChange = { user: TeamMember; role: Role } | { user: TeamMember; disabled: true };

/** What each role may do (docs/ARCHITECTURE.md §3), as the dialog tells the admin before a role changes. */
const MAY: Record<Role, string> = {
  admin: 'manage people and roles, and everything an engineer may',
  engineer: 'create products, dossiers and draft revisions, attach evidence and submit for review',
  reviewer: 'see everything, and approve or return revisions that someone else authored',
  viewer: 'read approved work only: approved revisions, their evidence and signed dossiers',
};

/** "an engineer", "a reviewer". */
const aRole = (role: Role) => `${role === 'admin' || role === 'engineer' ? 'an' : 'a'} ${role}`;

/** "Jonas Lindqvist is now a reviewer." — what the Team screen says once the server made the change. */
export function changeDone(before: TeamChange, after: TeamMember): string {
  return 'role' in before
    ? `✓ ${after.name} is now ${aRole(after.role)}.`
    : `✓ The account of ${after.name} is disabled and their sessions have ended.`;
}

interface Props {
  change: TeamChange | null;
  busy: boolean;
  error: string | null;
  onConfirm: (change: TeamChange) => void;
  onCancel: () => void;
}

export function TeamChangeDialog({ change, busy, error, onConfirm, onCancel }: Props) {
  const title = !change ? '' : 'role' in change ? `Make ${change.user.name} ${aRole(change.role)}?` : `Disable the account of ${change.user.name}?`;
  const consequences = !change
    ? []
    : 'role' in change
      ? [
          `From their next action ${change.user.name} may ${MAY[change.role]}.`,
          `As ${aRole(change.user.role)} they could ${MAY[change.user.role]}.`,
          'Their earlier work keeps its authors and signatures; the audit trail records the change.',
        ]
      : [
          `${change.user.name} is signed out at once and can no longer sign in.`,
          'Their revisions, decisions and audit entries stay as they are. You can enable the account again here.',
        ];
  return (
    <ConfirmDialog
      visible={change !== null}
      title={title}
      consequences={consequences}
      confirmLabel={!change ? '' : 'role' in change ? `Make ${change.role}` : 'Disable the account'}
      tone={change && !('role' in change) ? 'danger' : 'primary'}
      busy={busy}
      error={error}
      onCancel={onCancel}
      onConfirm={() => change && onConfirm(change)}
      testID="team-change-dialog"
    />
  );
}
