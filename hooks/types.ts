// Shapes of the API's answers as the app reads them (the server's JSON contract, DESIGN.md §5).
import type { EvidenceView, ReturnNoteView, RevisionView } from '../shared/schema/api';

export type { CheckChange, RevisionDiff } from '../shared/schema/api';
import type { DischargeResult, Requirement } from '../shared/schema/discharge';
import type { RevisionStatus } from '../shared/schema/workflow';

export type Verdict = DischargeResult['verdict'];

export interface Person {
  id: string;
  name: string;
  email?: string;
}

export interface Product {
  id: number;
  name: string;
  modelNumber: string;
  description: string;
  dossierCount?: number;
}

export interface DossierListItem {
  id: number;
  productId: number;
  title: string;
  requirement: Requirement;
  product: { id: number; name: string; modelNumber: string };
  latest: { id: number; number: number; status: RevisionStatus; updatedAt: string; verdict: Verdict } | null;
}

export interface RevisionListItem {
  id: number;
  number: number;
  status: RevisionStatus;
  verdict: Verdict;
  author: Person;
  createdFrom: number | null;
  createdAt: string;
  updatedAt: string;
  submittedAt: string | null;
  decidedAt: string | null;
  signedPdf: { sha256: string; size: number; createdAt: string } | null;
}

export interface Dossier {
  id: number;
  productId: number;
  title: string;
  requirement: Requirement;
  product: { id: number; name: string; modelNumber: string };
  revisions: RevisionListItem[];
}

export type EvidenceRecord = EvidenceView;

export interface Revision extends RevisionView {
  dossier: Omit<Dossier, 'revisions'>;
  siblings: Array<{ id: number; number: number; status: RevisionStatus }>;
  /** The return of the revision before this one, which this one answers; null when there was none. */
  answersReturn: ReturnNoteView | null;
}

export interface RevisionBrief {
  id: number;
  number: number;
  status: RevisionStatus;
  verdict: Verdict;
  updatedAt: string;
  dossier: { id: number; title: string; productName: string };
  authorName: string;
  /** On "returned to me" and "my drafts": the reviewer's reason for the return (being) answered. */
  returnNote?: ReturnNoteView | null;
}

export interface Overview {
  myDrafts: RevisionBrief[];
  returnedToMe: RevisionBrief[];
  awaitingMyReview: RevisionBrief[];
  recentlyApproved: RevisionBrief[];
}

export interface ReviewQueueItem {
  id: number;
  number: number;
  verdict: Verdict;
  submittedAt: string;
  dossier: { id: number; title: string; productName: string };
  author: Person;
  mayDecide: boolean;
}

export interface AuditReport {
  verified: boolean;
  firstBroken: { id: number; reason: string } | null;
  events: Array<{ id: number; action: string; actorName: string | null; subjectType: string; subjectId: string; createdAt: string; payload: unknown; hash: string }>;
}
