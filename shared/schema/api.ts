// Shapes the API answers with for a revision and its evidence, shared by the server that builds them
// and the app that reads them (the JSON names are part of the contract, docs/ARCHITECTURE.md §6.4).
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
  /** The signature's record: who signed, in which role, and what it means ("approved as reviewer"); null on decisions recorded before signatures. */
  signerName: string | null;
  signerRole: string | null;
  meaning: string | null;
}

/** A reviewer's return of a revision, as the next revision and the Overview show it. */
export interface ReturnNoteView {
  /** The revision that was returned. */
  revisionId: number;
  number: number;
  comment: string;
  reviewer: Person;
  at: string;
}

export interface RevisionView<E extends EvidenceView = EvidenceView> {
  id: number;
  dossierId: number;
  number: number;
  status: RevisionStatus;
  /** +1 on every stored change of the draft (inputs, notes, evidence, submission); writes name the one they read. */
  version: number;
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

// The diff of two revisions (GET /api/revisions/:id/diff), docs/ARCHITECTURE.md §6.4.

export interface InputChange {
  path: string;
  label: string;
  from: string;
  to: string;
  fromValue: number | string | null;
  toValue: number | string | null;
  /** SI unit of the raw values ("%" for fractions shown as percent, "" for counts and text). */
  unit: string;
  /** Relative change in %, when both sides are numbers and the old one is not zero. */
  changePct: number | null;
}

/** One side of a changed check; `informational` when it judges nothing (show "for information"). */
export interface CheckSide {
  value: number | null;
  pass: boolean;
  unit: string;
  informational: boolean;
}

export interface CheckChange {
  /** The check's id; checks are paired by it (a capture's checks by its file's hash). */
  id: string;
  label: string;
  from: CheckSide | null;
  to: CheckSide | null;
  /** "now-fails" stands out: a check that passed and no longer does. */
  kind: 'now-fails' | 'now-passes' | 'value-changed' | 'added' | 'removed';
  /** The evidence file a measured check comes from, to group it under the file name; null for design checks. */
  evidence: { name: string; sha256: string } | null;
}

export interface EvidenceBrief {
  name: string;
  sha256: string;
  kind: string;
}

export interface RevisionDiff {
  revision: { id: number; number: number };
  against: { id: number; number: number };
  inputs: InputChange[];
  verdict: { from: DischargeResult['verdict']; to: DischargeResult['verdict'] } | null;
  checks: CheckChange[];
  notes: { changed: boolean; parts: Array<{ added: boolean; removed: boolean; value: string }>; patch: string };
  /** Files by SHA-256: a file in both revisions is carried, not added or removed. */
  evidence: { added: EvidenceBrief[]; removed: EvidenceBrief[] };
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
  /** On "my drafts" and "returned to me": the reviewer's reason for the return being answered, or returned. */
  returnNote?: ReturnNoteView | null;
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
