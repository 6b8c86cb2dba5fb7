// Autosave of a draft's inputs and notes with optimistic concurrency: every save names the version it
// was based on, a save that meets a newer stored version never overwrites it, and the user's unsaved
// input is kept until they choose between theirs and the stored one.
import { useCallback, useEffect, useRef, useState } from 'react';
import { mergeDesigns } from '../shared/design-diff';
import type { RevisionView } from '../shared/schema/api';
import type { DesignDraft } from '../shared/schema/discharge';
import { ApiError, type FieldError } from './api';
import type { Revision } from './types';
import { staleRevision, useSaveRevision, useStoreRevision } from './use-revision';

const SAVE_DELAY_MS = 800;

export interface DraftContent {
  design: DesignDraft;
  notes: string;
}

/** What the server held when this page last agreed with it. */
export interface StoredDraft extends DraftContent {
  version: number;
  evidence: ReadonlyArray<{ sha256: string; originalName: string }>;
}

export type SaveState =
  | { kind: 'idle' }
  | { kind: 'saving' }
  | { kind: 'saved'; at: string }
  | { kind: 'invalid'; fields: FieldError[] }
  | { kind: 'failed'; message: string }
  /**
   * Saved elsewhere since this page read it (`base` → `stored`, as the server holds them), and this page
   * has unsaved input (`synced` → the current content, as typed here): the user chooses.
   */
  | { kind: 'conflict'; base: StoredDraft; synced: DraftContent; stored: RevisionView };

const sameContent = (a: DraftContent, b: DraftContent) => a.notes === b.notes && JSON.stringify(a.design) === JSON.stringify(b.design);
const storedOf = (r: Pick<RevisionView, 'version' | 'design' | 'notes' | 'evidence'>): StoredDraft => ({
  version: r.version,
  design: r.design,
  notes: r.notes,
  evidence: r.evidence,
});

export function useDraftAutosave(revision: Revision, editable: boolean) {
  // `mutate` keeps its identity across renders (the mutation result object does not).
  const { mutate } = useSaveRevision(revision.id);
  const store = useStoreRevision(revision.id);
  const [content, setContent] = useState<DraftContent>({ design: revision.design, notes: revision.notes });
  const [state, setState] = useState<SaveState>({ kind: 'idle' });
  // Refs, not state: the timer and the save callbacks must see the latest values, not a render's copy.
  const latest = useRef(content);
  // The stored draft this page is based on, in the server's form (defaults filled in by the schema) …
  const base = useRef<StoredDraft>(storedOf(revision));
  // … and the same content in this page's form: input differing from it is not saved yet.
  const synced = useRef<DraftContent>(content);
  const inFlight = useRef(false);
  const conflicted = useRef(false);
  const timer = useRef<ReturnType<typeof setTimeout> | null>(null);

  const showConflict = useCallback((stored: RevisionView) => {
    conflicted.current = true;
    setState({ kind: 'conflict', base: base.current, synced: synced.current, stored });
  }, []);

  const flush = useCallback(() => {
    if (timer.current) clearTimeout(timer.current);
    timer.current = null;
    if (!editable || inFlight.current || conflicted.current || sameContent(latest.current, synced.current)) return;
    const sent = latest.current;
    inFlight.current = true;
    setState({ kind: 'saving' });
    mutate(
      { version: base.current.version, design: sent.design, notes: sent.notes },
      {
        onSuccess: (rev) => {
          inFlight.current = false;
          base.current = storedOf(rev);
          synced.current = sent;
          setState({ kind: 'saved', at: rev.updatedAt });
          // Typed while the save was on its way: that goes next, on top of the version just stored.
          if (!sameContent(latest.current, synced.current)) flush();
        },
        onError: (err) => {
          inFlight.current = false;
          const stored = staleRevision(err);
          if (stored && stored.status === 'draft' && sameContent(stored, base.current)) {
            // Only the evidence list moved on (this user's own upload, say): nothing to lose, save on top.
            base.current = storedOf(stored);
            flush();
          } else if (stored && stored.status === 'draft') {
            showConflict(stored);
          } else if (err instanceof ApiError && err.status === 400) {
            setState({ kind: 'invalid', fields: err.fields });
          } else {
            setState({ kind: 'failed', message: err.message });
          }
        },
      },
    );
  }, [editable, mutate, showConflict]);

  const edit = useCallback(
    (next: Partial<DraftContent>) => {
      latest.current = { ...latest.current, ...next };
      setContent(latest.current);
      if (!editable || conflicted.current) return;
      if (timer.current) clearTimeout(timer.current);
      timer.current = setTimeout(flush, SAVE_DELAY_MS);
    },
    [editable, flush],
  );

  // A newer stored version reached this page another way (a refetch after an upload, the window
  // regaining focus): taken silently when there is nothing of the user's to lose.
  useEffect(() => {
    if (revision.version <= base.current.version || inFlight.current || conflicted.current) return;
    const stored = storedOf(revision);
    if (sameContent(stored, base.current)) {
      base.current = stored;
    } else if (sameContent(latest.current, synced.current)) {
      base.current = stored;
      latest.current = { design: stored.design, notes: stored.notes };
      synced.current = latest.current;
      setContent(latest.current);
    } else {
      showConflict(revision);
    }
  }, [revision, showConflict]);

  // Leaving the page sends what is still waiting for the timer.
  useEffect(() => () => flush(), [flush]);

  /** Keeps the user's changes: applied on top of the stored version they have now seen, and saved. */
  const keepMine = useCallback(() => {
    if (state.kind !== 'conflict') return;
    const { synced: from, stored } = state;
    const mine = latest.current;
    latest.current = { design: mergeDesigns(from.design, mine.design, stored.design), notes: mine.notes !== from.notes ? mine.notes : stored.notes };
    base.current = storedOf(stored);
    synced.current = { design: stored.design, notes: stored.notes };
    conflicted.current = false;
    setContent(latest.current);
    setState({ kind: 'idle' });
    flush();
  }, [state, flush]);

  /** Drops the user's unsaved input for what is stored. */
  const takeStored = useCallback(() => {
    if (state.kind !== 'conflict') return;
    base.current = storedOf(state.stored);
    latest.current = { design: state.stored.design, notes: state.stored.notes };
    synced.current = latest.current;
    conflicted.current = false;
    setContent(latest.current);
    setState({ kind: 'idle' });
    store(state.stored);
  }, [state, store]);

  return { content, edit, state, keepMine, takeStored };
}
