// Shapes of the API's answers as the app reads them (the server's JSON contract, docs/ARCHITECTURE.md §6.4).
import type { EvidenceView, ReturnNoteView, RevisionSummary, RevisionView } from '../shared/schema/api';

export type { CheckChange, DossierListItem, Overview, OverviewList, ReviewQueueItem, RevisionDiff, RevisionSummary } from '../shared/schema/api';
export type { Page } from '../shared/schema/lists';
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

export interface Dossier {
  id: number;
  productId: number;
  title: string;
  requirement: Requirement;
  product: { id: number; name: string; modelNumber: string };
  revisions: RevisionSummary[];
}

export type EvidenceRecord = EvidenceView;

export interface Revision extends RevisionView {
  dossier: Omit<Dossier, 'revisions'>;
  siblings: Array<{ id: number; number: number; status: RevisionStatus }>;
  /** The return of the revision before this one, which this one answers; null when there was none. */
  answersReturn: ReturnNoteView | null;
}

export interface AuditReport {
  verified: boolean;
  firstBroken: { id: number; reason: string } | null;
  events: Array<{
    id: number;
    action: string;
    actorName: string | null;
    subjectType: string;
    subjectId: string;
    createdAt: string;
    payload: unknown;
    hash: string;
  }>;
}
