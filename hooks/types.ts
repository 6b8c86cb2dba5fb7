// Shapes of the API's answers as the app reads them (the server's JSON contract, DESIGN.md §5).
import type { EvidenceView, RevisionSummary, RevisionView } from '../shared/schema/api';
import type { DischargeResult, Requirement } from '../shared/schema/discharge';
import type { RevisionStatus } from '../shared/schema/workflow';

export type Verdict = DischargeResult['verdict'];
export type { DossierListItem, Overview, OverviewList, ReviewQueueItem, RevisionSummary } from '../shared/schema/api';
export type { Page } from '../shared/schema/lists';

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
}

export interface RevisionDiff {
  revision: { id: number; number: number };
  against: { id: number; number: number };
  inputs: Array<{ path: string; label: string; from: string; to: string; changePct: number | null }>;
  verdict: { from: Verdict; to: Verdict } | null;
  checks: Array<{
    id: string;
    label: string;
    from: { value: number | null; pass: boolean; unit: string } | null;
    to: { value: number | null; pass: boolean; unit: string } | null;
    kind: 'now-fails' | 'now-passes' | 'value-changed' | 'added' | 'removed';
  }>;
  notes: { changed: boolean; parts: Array<{ added: boolean; removed: boolean; value: string }>; patch: string };
  evidence: { added: Array<{ name: string; sha256: string; kind: string }>; removed: Array<{ name: string; sha256: string; kind: string }> };
}

export interface AuditReport {
  verified: boolean;
  firstBroken: { id: number; reason: string } | null;
  events: Array<{ id: number; action: string; actorName: string | null; createdAt: string; payload: unknown; hash: string }>;
}
