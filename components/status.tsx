import { STATUS_WORDS, type RevisionStatus } from '../shared/schema/workflow';
import type { Verdict } from '../hooks/types';
import { Badge, type Tone } from './ui/badge';

const STATUS_TONE: Record<RevisionStatus, Tone> = { draft: 'neutral', in_review: 'pending', approved: 'pass', returned: 'fail' };

export function StatusBadge({ status, testID }: { status: RevisionStatus; testID?: string }) {
  return <Badge label={STATUS_WORDS[status]} tone={STATUS_TONE[status]} testID={testID} />;
}

const VERDICT: Record<Verdict, { label: string; tone: Tone }> = {
  meets: { label: 'Calculation meets', tone: 'pass' },
  fails: { label: 'Calculation fails', tone: 'fail' },
  incomplete: { label: 'Inputs incomplete', tone: 'info' },
};

export function VerdictBadge({ verdict, testID }: { verdict: Verdict; testID?: string }) {
  return <Badge label={VERDICT[verdict].label} tone={VERDICT[verdict].tone} testID={testID} />;
}
