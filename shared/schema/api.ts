// Shapes the API answers with for a revision and its evidence, shared by the server that builds them
// and the app that reads them (the JSON names are part of the contract, DESIGN.md §5).
import type { DesignDraft, DischargeResult } from './discharge';
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
