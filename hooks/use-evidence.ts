import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { apiSend, apiUpload } from './api';
import { keys } from './query-keys';
import type { EvidenceRecord } from './types';

export type EvidenceKind = EvidenceRecord['kind'];

/** Uploads one file to a draft revision, reporting progress (0…1) while it goes. */
export function useUploadEvidence(revisionId: number, dossierId: number) {
  const client = useQueryClient();
  const [progress, setProgress] = useState<number | null>(null);
  const mutation = useMutation({
    mutationFn: async ({
      file,
      kind,
      version,
      channel,
      markerChannel,
      t0,
      probeResistance,
      scale,
    }: {
      file: Blob;
      name: string;
      kind: EvidenceKind;
      /** The revision version the uploader last read. */
      version: number;
      channel?: string;
      markerChannel?: string;
      t0?: string;
      /** Ω, as text the server reads with the same parser as every field. */
      probeResistance?: string;
      /** Voltage scale factor for probe-side volts. */
      scale?: string;
    }) => {
      const form = new FormData();
      form.append('kind', kind);
      // The version the list on screen belongs to: a list changed elsewhere meanwhile answers 409.
      form.append('version', String(version));
      // Fields go before the file so the server reads them before the bytes arrive.
      if (channel) form.append('channel', channel);
      if (markerChannel) form.append('markerChannel', markerChannel);
      if (t0) form.append('t0', t0);
      if (probeResistance) form.append('probeResistance', probeResistance);
      if (scale) form.append('scale', scale);
      form.append('file', file, (file as File).name);
      setProgress(0);
      try {
        return await apiUpload<EvidenceRecord>(`/revisions/${revisionId}/evidence`, form, setProgress);
      } finally {
        setProgress(null);
      }
    },
    // Refetched either way: after a 409 the list on screen is the one stored now.
    onSettled: () => {
      void client.invalidateQueries({ queryKey: keys.revision(revisionId) });
      void client.invalidateQueries({ queryKey: keys.dossier(dossierId) });
    },
  });
  return { ...mutation, progress };
}

export function useRemoveEvidence(revisionId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: ({ evidenceId, version }: { evidenceId: number; version: number }) =>
      apiSend<{ ok: true; revisionVersion: number }>('DELETE', `/evidence/${evidenceId}?version=${version}`),
    onSettled: () => client.invalidateQueries({ queryKey: keys.revision(revisionId) }),
  });
}
