// Shapes the API answers with for a revision and its evidence, shared by the server that builds them
// and the app that reads them (the JSON names are part of the contract, DESIGN.md §5).
import type { DesignDraft, DischargeResult, Requirement } from './discharge';
import type { Page } from './lists';
import type { WaveformAnalysis } from './waveform';
import type { RevisionStatus } from './workflow';

export interface Person {
  id: string;
  name: string;
  email: string;
}

export type EvidenceKind = 'waveform' | 'image' | 'datasheet' | 'report' | 'other';

export interface EvidenceView {
  id: number;
  revisionId: number;
  kind: EvidenceKind;
  originalName: string;
  mediaType: string;
  size: number;
  sha256: string;
  analysis: WaveformAnalysis | null;
  uploadedBy: Person;
  uploadedAt: string;
}

export interface DecisionView {
  decision: 'approve' | 'return';
  comment: string;
  contentHash: string;
  reviewer: Person;
  at: string;
}

export interface RevisionView<E extends EvidenceView = EvidenceView> {
  id: number;
  dossierId: number;
  number: number;
  status: RevisionStatus;
  design: DesignDraft;
  notes: string;
  results: DischargeResult;
  engineVersion: string;
  author: Person;
  createdFrom: number | null;
  contentHash: string | null;
  createdAt: string;
  updatedAt: string;
  submittedAt: string | null;
  decidedAt: string | null;
  evidence: E[];
  decision: DecisionView | null;
  comments: Array<{ id: number; author: Person; body: string; at: string }>;
  signedPdf: { sha256: string; size: number; createdAt: string; signerKind: string } | null;
}

/** A revision as the lists show it (overview, review queue, a dossier's revisions): no inputs or results. */
export interface RevisionSummary {
  id: number;
  dossierId: number;
  number: number;
  status: RevisionStatus;
  verdict: DischargeResult['verdict'];
  author: { id: string; name: string };
  createdFrom: number | null;
  createdAt: string;
  updatedAt: string;
  submittedAt: string | null;
  decidedAt: string | null;
  dossier: { id: number; title: string; productId: number; productName: string };
  signedPdf: { sha256: string; size: number; createdAt: string } | null;
}

export interface ReviewQueueItem extends RevisionSummary {
  /** False for the author and for admins: they see the queue but may not decide. */
  mayDecide: boolean;
}

export interface DossierListItem {
  id: number;
  productId: number;
  title: string;
  requirement: Requirement;
  product: { id: number; name: string; modelNumber: string };
  latest: { id: number; number: number; status: RevisionStatus; updatedAt: string; verdict: DischargeResult['verdict'] } | null;
}

export const OVERVIEW_LISTS = ['myDrafts', 'returnedToMe', 'awaitingMyReview', 'recentlyApproved'] as const;
export type OverviewList = (typeof OVERVIEW_LISTS)[number];
export type Overview = Record<OverviewList, Page<RevisionSummary>>;
