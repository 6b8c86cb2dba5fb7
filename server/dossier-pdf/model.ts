// Everything the dossier PDF prints, gathered by the caller (routes, database) into plain data.
// The renderer reads nothing else, so a test or a benchmark can build one by hand.
import type { DesignDraft, DischargeResult, Requirement } from '../../shared/schema/discharge';
import type { WaveformAnalysis } from '../../shared/schema/waveform';

export type Id = string | number;
/** An ISO 8601 string or a Date; printed in UTC. */
export type Timestamp = string | Date;

export type RevisionStatus = 'draft' | 'in_review' | 'approved' | 'returned';
export type EvidenceKind = 'waveform' | 'image' | 'datasheet' | 'report' | 'other';

export interface Person {
  name: string;
  email: string;
}

export interface EvidenceEntry {
  id: Id;
  kind: EvidenceKind;
  originalName: string;
  mediaType: string;
  /** Bytes. */
  size: number;
  /** Lower-case hex, 64 characters. */
  sha256: string;
  uploadedBy: Person;
  uploadedAt: Timestamp;
  analysis?: WaveformAnalysis | null;
}

interface ChangedInput {
  /** Field path, e.g. "design.bleeder.resistance". */
  path: string;
  label: string;
  from: number | string | boolean | null;
  to: number | string | boolean | null;
  /** SI unit of numeric values ("" for counts and text). */
  unit: string;
  /** Relative change in percent, null when not numeric on both sides. */
  changePct: number | null;
}

export interface ChangedCheck {
  id: string;
  label: string;
  /** The capture an evidence-derived check comes from; null or absent for calculated checks. */
  evidence?: { name: string; sha256: string } | null;
  /** Null when the check did not exist on that side. */
  fromPass: boolean | null;
  toPass: boolean | null;
  from: number | null;
  to: number | null;
  /** Unit of `from`/`to`; taken from the revision's own check when omitted. */
  unit?: string;
}

interface DiffSummary {
  against: { id: Id; number: number };
  inputs: ChangedInput[];
  checks: ChangedCheck[];
  /** Unified diff of the notes; empty when they did not change. */
  notesDiff: string;
  evidenceAdded: Array<{ originalName: string; sha256: string }>;
  evidenceRemoved: Array<{ originalName: string; sha256: string }>;
}

export interface ReviewEntry {
  /** The revision decided on; omitted means this revision. Earlier revisions' decisions give the history. */
  revisionNumber?: number;
  reviewer: Person;
  decision: 'approve' | 'return';
  comment: string;
  /** The revision's content hash at the moment of the decision. */
  contentHash: string;
  at: Timestamp;
  /** As recorded with the electronic signature; older records fall back to the reviewer's name and "reviewer". */
  signerName?: string | null;
  signerRole?: string | null;
  /** E.g. "approved as reviewer"; falls back to the decision in words. */
  meaning?: string | null;
}

export interface AuditEntry {
  id: Id;
  at: Timestamp;
  /** The actor's name; null for the system. */
  actor: string | null;
  /** E.g. "revision.submit". */
  action: string;
  /** The revision the event concerns, by number, when it concerns one. */
  revisionNumber: number | null;
  payload: Record<string, unknown>;
  /** The event in words, made by the same helper as the app's audit trail, so both say the same thing. */
  sentence: string;
  hash: string;
}

interface AuditSummary {
  verified: boolean;
  /** This dossier's events, oldest first. */
  events: AuditEntry[];
  /** Hash of the newest event of the whole chain when the dossier was generated. */
  headHash: string | null;
  firstBroken?: { id: Id; at?: Timestamp; reason?: string } | null;
}

interface SignerSummary {
  kind: 'development' | 'organisation';
  subject: string;
  fingerprintSha256?: string;
  /** Where the signature's trusted time comes from; null when it is signed without one (TSA_URL=none). */
  timestampAuthority: string | null;
}

export interface DossierPdfModel {
  organisation: string;
  product: { name: string; modelNumber: string; description: string };
  dossier: { id: Id; title: string; requirement: Requirement };
  revision: {
    id: Id;
    number: number;
    status: RevisionStatus;
    author: Person;
    createdAt: Timestamp;
    submittedAt: Timestamp | null;
    decidedAt: Timestamp | null;
    notes: string;
    design: DesignDraft;
    results: DischargeResult;
    /** SHA-256 (hex) of the revision's frozen content. */
    contentHash: string;
  };
  evidence: EvidenceEntry[];
  /** Against the revision this one was started from; null for a first revision. */
  diff: DiffSummary | null;
  /** Review decisions on this dossier's revisions up to this one, oldest first. */
  reviews: ReviewEntry[];
  audit: AuditSummary;
  signer: SignerSummary;
  generatedAt: Timestamp;
}

/** The decisions taken on this revision itself, oldest first. */
export function decisionsOnRevision(model: DossierPdfModel): ReviewEntry[] {
  return model.reviews.filter((r) => r.revisionNumber === undefined || r.revisionNumber === model.revision.number);
}

/** The approval this revision's signature rests on: its latest approving decision. */
export function approvalOf(model: DossierPdfModel): ReviewEntry | null {
  const approvals = decisionsOnRevision(model).filter((r) => r.decision === 'approve');
  return approvals.length ? approvals[approvals.length - 1] : null;
}
