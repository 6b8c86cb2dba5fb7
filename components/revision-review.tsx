import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, space, type } from '../constants/theme';
import { decisionSchema } from '../shared/schema/workflow';
import { ApiError } from '../hooks/api';
import type { Revision } from '../hooks/types';
import type { Me } from '../hooks/use-me';
import { useAddComment, useDecideRevision, useSubmitRevision } from '../hooks/use-revision';
import { formatWhen } from '../shared/dates';
import { ApprovalDialog } from './approval-dialog';
import { StatusBadge, VerdictBadge } from './status';
import { Button } from './ui/button';
import { Card } from './ui/card';
import { Message } from './ui/message';
import { TextField } from './ui/text-field';

/** Submission, the reviewer's decision, and the conversation about a revision. */
export function RevisionReview({ revision, me }: { revision: Revision; me: Me }) {
  const submit = useSubmitRevision(revision.id);
  const decide = useDecideRevision(revision.id);
  const comment = useAddComment(revision.id);
  const [decisionText, setDecisionText] = useState('');
  const [commentText, setCommentText] = useState('');
  const [localError, setLocalError] = useState<string | undefined>();
  const [signing, setSigning] = useState(false);
  const isAuthor = revision.author.id === me.id;
  const mayDecide = me.role === 'reviewer' && !isAuthor && revision.status === 'in_review';
  const mayComment = me.role === 'reviewer' || isAuthor;
  const fieldOf = (path: string) => (decide.error instanceof ApiError ? decide.error.fields.find((f) => f.path === path)?.message : undefined);
  const fieldError = localError ?? fieldOf('comment');
  const passwordError = fieldOf('password');

  // The same rule the server applies, checked first so the reviewer sees it at once.
  function send(decision: 'approve' | 'return', password?: string) {
    const parsed = decisionSchema.safeParse({ decision, comment: decisionText, password });
    setLocalError(parsed.success ? undefined : parsed.error.issues.find((i) => i.path[0] === 'comment')?.message);
    if (parsed.success) decide.mutate(parsed.data, { onSuccess: () => setSigning(false) });
  }

  function openSigning() {
    decide.reset();
    setSigning(true);
  }

  return (
    <View style={styles.wrap} testID="review-tab">
      <Card title="Status">
        <View style={styles.inline}>
          <StatusBadge status={revision.status} testID="review-status" />
          <VerdictBadge verdict={revision.results.verdict} />
        </View>
        <Text style={type.small}>
          Author {revision.author.name} · created {formatWhen(revision.createdAt)}
          {revision.submittedAt ? ` · submitted ${formatWhen(revision.submittedAt)}` : ''}
        </Text>
        {revision.contentHash ? <Text style={[type.mono, styles.hash]}>Content hash {revision.contentHash}</Text> : null}
      </Card>

      {revision.status === 'draft' && isAuthor ? (
        <Card title="Submit for review">
          <Text style={type.body}>
            Submitting freezes the inputs, notes, results and evidence list of revision {revision.number}. Every reviewer is e-mailed.
          </Text>
          {revision.results.verdict !== 'meets' ? (
            <Message
              tone="error"
              text={
                revision.results.verdict === 'fails'
                  ? 'The calculation fails at least one check. You may still submit it for a reviewer to see.'
                  : 'Some inputs are missing; the verdict is incomplete.'
              }
            />
          ) : null}
          {submit.error ? <Message tone="error" text={submit.error.message} /> : null}
          <View style={styles.button}>
            <Button label={`Submit revision ${revision.number}`} testID="submit-revision" busy={submit.isPending} onPress={() => submit.mutate()} />
          </View>
        </Card>
      ) : null}
      {revision.status === 'draft' && !isAuthor ? <Message text={`This draft belongs to ${revision.author.name}; only they submit it.`} /> : null}

      {mayDecide ? (
        <Card title="Your decision">
          <TextField
            label="Comment (required to return)"
            testID="decision-comment"
            multiline
            value={decisionText}
            onChangeText={setDecisionText}
            error={fieldError}
            placeholder="What you checked, or what must change"
          />
          {decide.error && !fieldError && !signing ? <Message tone="error" text={decide.error.message} /> : null}
          {revision.results.verdict !== 'meets' ? (
            <Message
              testID="approve-blocked"
              text={
                revision.results.verdict === 'fails'
                  ? 'The calculation fails at least one check, so this revision can only be returned.'
                  : 'Inputs are incomplete, so this revision can only be returned.'
              }
            />
          ) : null}
          <View style={styles.inline}>
            <Button
              label="Approve and sign…"
              testID="approve"
              disabled={revision.results.verdict !== 'meets' || decide.isPending}
              onPress={openSigning}
            />
            <Button label="Return for changes" variant="danger" testID="return" busy={decide.isPending} onPress={() => send('return')} />
          </View>
        </Card>
      ) : null}
      {mayDecide && signing ? (
        <ApprovalDialog
          revision={revision}
          signerName={me.name}
          signerRole={me.role}
          busy={decide.isPending}
          passwordError={passwordError}
          error={decide.error && !passwordError ? decide.error.message : undefined}
          onSign={(password) => send('approve', password)}
          onCancel={() => setSigning(false)}
        />
      ) : null}
      {me.role === 'reviewer' && isAuthor && revision.status === 'in_review' ? (
        <Message text="You authored this revision, so another reviewer must decide on it." testID="own-revision" />
      ) : null}

      {revision.decision ? (
        <Card title="Decision" testID="decision">
          <Text style={[styles.decision, { color: revision.decision.decision === 'approve' ? colors.pass : colors.fail }]}>
            {revision.decision.decision === 'approve' ? '✓ Approved' : '✕ Returned for changes'} by {revision.decision.reviewer.name},{' '}
            {formatWhen(revision.decision.at)}
          </Text>
          {revision.decision.meaning ? (
            <Text style={type.small} testID="decision-signature">
              {revision.decision.decision === 'approve' ? 'Signed' : 'Recorded'} by {revision.decision.signerName} ({revision.decision.signerRole}):{' '}
              {revision.decision.meaning}
            </Text>
          ) : null}
          {revision.decision.comment ? <Text style={type.body}>“{revision.decision.comment}”</Text> : null}
          <Text style={[type.mono, styles.hash]}>Decided on content hash {revision.decision.contentHash}</Text>
        </Card>
      ) : null}

      <Card title="Discussion">
        {revision.comments.length === 0 ? <Text style={type.body}>No comments.</Text> : null}
        {revision.comments.map((c) => (
          <View key={c.id} style={styles.comment}>
            <Text style={type.label}>
              {c.author.name} · {formatWhen(c.at)}
            </Text>
            <Text style={type.body}>{c.body}</Text>
          </View>
        ))}
        {mayComment ? (
          <>
            <TextField label="Add a comment" testID="comment-body" multiline value={commentText} onChangeText={setCommentText} />
            {comment.error ? <Message tone="error" text={comment.error.message} /> : null}
            <View style={styles.button}>
              <Button
                label="Post comment"
                variant="secondary"
                testID="post-comment"
                busy={comment.isPending}
                onPress={() => comment.mutate(commentText, { onSuccess: () => setCommentText('') })}
              />
            </View>
          </>
        ) : null}
      </Card>
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: space.lg },
  inline: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, alignItems: 'center' },
  button: { alignSelf: 'flex-start' },
  hash: { fontSize: 11, color: colors.inkMuted },
  decision: { fontFamily: fonts.bold, fontSize: 16 },
  comment: { borderTopWidth: 1, borderTopColor: colors.line, paddingVertical: space.sm, gap: 2 },
});
