// An audit event as one sentence a reader can follow ("Marta Kowalczyk approved revision 2: “…”"),
// shared by the app's audit trail and the PDF dossier so both say the same thing.

/** What the sentence needs of an event; the server's events and the API's answer both carry it. */
interface AuditEventLike {
  action: string;
  actorName: string | null;
  subjectType: string;
  subjectId: string | number;
  payload: unknown;
}

interface AuditSentenceContext {
  /** The number of a revision by its id, for events whose payload names the revision by id only. */
  revisionNumber?: (revisionId: number) => number | undefined;
  /** The name of a user by id, for events about an account. */
  userName?: (userId: string) => string | undefined;
}

type Payload = Record<string, unknown>;

const text = (p: Payload, key: string): string | undefined => (typeof p[key] === 'string' && p[key] !== '' ? (p[key] as string) : undefined);
const num = (p: Payload, key: string): number | undefined => (typeof p[key] === 'number' ? (p[key] as number) : undefined);
const quoted = (s: string) => `“${s.trim()}”`;

const VERDICT_WORDS: Record<string, string> = {
  meets: 'the calculation meets every check',
  fails: 'the calculation fails at least one check',
  incomplete: 'the inputs are incomplete',
};

const EVIDENCE_KIND_WORDS: Record<string, string> = {
  waveform: 'scope capture',
  image: 'image',
  datasheet: 'datasheet',
  report: 'test report',
  other: 'file',
};

/** "revision 3", from the payload's number, else from the revision's id; "a revision" when neither is known. */
function revisionName(event: AuditEventLike, payload: Payload, context: AuditSentenceContext): string {
  const byNumber = num(payload, 'number');
  if (byNumber !== undefined && event.subjectType === 'revision') return `revision ${byNumber}`;
  const id = event.subjectType === 'revision' ? Number(event.subjectId) : num(payload, 'revisionId');
  const n = id === undefined ? undefined : context.revisionNumber?.(id);
  return n === undefined ? 'a revision' : `revision ${n}`;
}

/** What an update of a draft changed, from the payload's field list. */
function changedParts(payload: Payload): string {
  const fields = Array.isArray(payload.fields) ? payload.fields.filter((f): f is string => typeof f === 'string') : [];
  const design = fields.includes('design');
  const notes = fields.includes('notes');
  return design && notes ? 'the inputs and notes' : notes ? 'the notes' : 'the inputs';
}

/** One sentence, ending in a full stop, that says who did what to which revision, file or account. */
export function auditSentence(event: AuditEventLike, context: AuditSentenceContext = {}): string {
  const payload: Payload = event.payload && typeof event.payload === 'object' ? (event.payload as Payload) : {};
  const who = event.actorName ?? 'The system';
  const revision = () => revisionName(event, payload, context);
  const verdict = text(payload, 'verdict');
  const verdictClause = verdict && VERDICT_WORDS[verdict] ? `; ${VERDICT_WORDS[verdict]}` : '';
  const comment = text(payload, 'comment');
  const file = text(payload, 'name');

  switch (event.action) {
    case 'dossier.create': {
      const title = text(payload, 'title');
      return `${who} created the dossier${title ? ` ${quoted(title)}` : ''}.`;
    }
    case 'revision.create': {
      const from = num(payload, 'createdFrom');
      const fromNumber = from === undefined ? undefined : context.revisionNumber?.(from);
      return `${who} started ${revision()}${fromNumber !== undefined ? ` from revision ${fromNumber}` : ''}.`;
    }
    case 'revision.update':
      return `${who} saved ${changedParts(payload)} of ${revision()}${verdictClause}.`;
    case 'revision.submit':
      return `${who} submitted ${revision()} for review${verdictClause}.`;
    case 'revision.approved':
      return `${who} approved ${revision()}${comment ? `: ${quoted(comment)}` : '.'}`;
    case 'revision.returned':
      return `${who} returned ${revision()} for changes${comment ? `: ${quoted(comment)}` : '.'}`;
    case 'revision.comment': {
      const body = text(payload, 'body');
      return `${who} commented on ${revision()}${body ? `: ${quoted(body)}` : '.'}`;
    }
    case 'evidence.add': {
      const kind = text(payload, 'kind');
      const kindWords = kind ? (EVIDENCE_KIND_WORDS[kind] ?? kind) : 'file';
      return `${who} attached the ${kindWords} ${file ? quoted(file) : '(unnamed)'} to ${revision()}.`;
    }
    case 'evidence.remove':
      return `${who} removed ${file ? quoted(file) : 'a file'} from ${revision()}.`;
    case 'product.create': {
      const name = text(payload, 'name');
      const model = text(payload, 'modelNumber');
      return `${who} added the product ${name ?? '(unnamed)'}${model ? ` (${model})` : ''}.`;
    }
    case 'user.invite':
      return `${who} invited ${text(payload, 'email') ?? 'someone'}${text(payload, 'role') ? ` as ${text(payload, 'role')}` : ''}.`;
    case 'user.update': {
      const target = context.userName?.(String(event.subjectId)) ?? 'a user';
      const parts = [
        text(payload, 'role') ? `made ${target} ${text(payload, 'role')}` : null,
        payload.disabled === true ? `disabled the account of ${target}` : payload.disabled === false ? `enabled the account of ${target}` : null,
      ].filter(Boolean);
      return `${who} ${parts.length ? parts.join(' and ') : `changed the account of ${target}`}.`;
    }
    case 'user.sign_in':
      return `${who} signed in.`;
    case 'user.set_password':
      return `${who} set a password.`;
    default:
      // An action added later still reads as words rather than as a code.
      return `${who}: ${event.action.replace(/[._]/g, ' ')}${event.subjectType === 'revision' || event.subjectType === 'evidence' ? `, ${revision()}` : ''}.`;
  }
}
