// Invented demo dossier (the seed company's servo drive) for the PDF tests and the benchmark.
// Results come from the real engine; the "measured" waveforms are synthetic exponential captures with
// seeded noise, and their analyses are written from the parameters that generated them.
import { createHash } from 'node:crypto';
import { auditSentence } from '../../shared/audit-sentences';
import type { DesignDraft, DischargeResult, Requirement } from '../../shared/schema/discharge';
import type { WaveformAnalysis } from '../../shared/schema/waveform';
import { computeDischarge } from '../../shared/engine/index';
import { computeRevisionResults } from '../../shared/engine/revision-results';
import type { AuditEntry, ChangedCheck, DossierPdfModel, EvidenceEntry, Person, RevisionStatus } from '../../server/dossier-pdf/model';

export const AUTHOR: Person = { name: 'Tomas Berglund', email: 'engineer@fennel.test' };
export const REVIEWER: Person = { name: 'Ilse Marchetti', email: 'reviewer@fennel.test' };

export const REQUIREMENT: Requirement = {
  safeVoltage: 60,
  maxTime: 5,
  maxEnergy: null,
  maxCharge: null,
  fallbackMaxTime: null,
  singleFault: false,
  condition: 'After mains disconnection at the voltage peak; terminal cover removable without a tool',
  reference: 'IEC 61800-5-1 (edition and clause to be confirmed by the compliance engineer)',
};

const BASE_DESIGN: DesignDraft = {
  bus: { nominalVoltage: 565, maxVoltage: 622 },
  capacitors: { capacitance: 2.2e-4, series: 2, parallel: 2, toleranceMinus: 0.2, tolerancePlus: 0.2, ageing: 0.1 },
  bleeder: {
    resistance: 4.7e3,
    series: 4,
    parallel: 2,
    tolerance: 0.01,
    tcrPpmPerK: 100,
    drift: 0.01,
    powerRating: 10,
    elementVoltage: 500,
    derating: 0.6,
  },
  ambient: { min: -25, max: 70 },
  active: null,
  balancing: { leakageCurrent: 1e-3, capacitorVoltageRating: 450 },
};

/** Revision 1 (returned: too slow in the worst case) and revision 2 (three strings of three 7.5 kΩ). */
export const DESIGN_R1: DesignDraft = BASE_DESIGN;
export const DESIGN_R2: DesignDraft = { ...BASE_DESIGN, bleeder: { ...BASE_DESIGN.bleeder, resistance: 7.5e3, series: 3, parallel: 3 } };

export interface FixtureFile {
  entry: EvidenceEntry;
  bytes: Buffer;
}

export interface Fixture {
  model: DossierPdfModel;
  files: FixtureFile[];
}

/** Small deterministic generator so every run writes the same capture files. */
function seeded(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
    return state / 2 ** 32;
  };
}

interface Capture {
  name: string;
  v0: number;
  tau: number;
  seed: number;
  t0Source: WaveformAnalysis['t0Source'];
}

function capture(c: Capture, points: number, uploadedAt: string, id: number): FixtureFile {
  const random = seeded(c.seed);
  const step = 10 / points;
  const trace = Array.from({ length: points }, (_, i) => {
    const t = -0.5 + i * step;
    const ideal = t < 0 ? c.v0 : c.v0 * Math.exp(-t / c.tau);
    return { t: Number(t.toFixed(6)), v: Number((ideal + (random() - 0.5) * 2.4).toFixed(3)) };
  });
  const csv = [
    '# Instrument,Demo recorder DR-4',
    '# Probe,100:1 differential',
    '# Channel,CH1 DC link',
    'Time (s),CH1 (V)',
    ...trace.map((p) => `${p.t.toExponential(6)},${p.v.toFixed(3)}`),
  ].join('\n');
  const bytes = Buffer.from(`${csv}\n`, 'utf8');
  const analysis: WaveformAnalysis = {
    samples: points,
    skipped: 0,
    channel: 'CH1 (V)',
    channels: ['CH1 (V)'],
    t0: 0,
    t0Source: c.t0Source,
    v0: c.v0,
    safeVoltage: REQUIREMENT.safeVoltage,
    timeToSafe: c.tau * Math.log(c.v0 / REQUIREMENT.safeVoltage),
    vAtLimit: c.v0 * Math.exp(-REQUIREMENT.maxTime / c.tau),
    tau: c.tau,
    rSquared: 0.99971,
    residualRms: 0.69,
    fitWindow: { from: c.tau * 0.105, to: c.tau * 2.3 },
    offset: 0.02,
    fit: 'good',
    trace,
    notes: ['Probe ratio 100:1 already applied by the instrument.', 'Disconnection instant at the trigger (t = 0).'],
  };
  return {
    bytes,
    entry: {
      id,
      kind: 'waveform',
      originalName: c.name,
      mediaType: 'text/csv',
      size: bytes.length,
      sha256: createHash('sha256').update(bytes).digest('hex'),
      uploadedBy: AUTHOR,
      uploadedAt,
      analysis,
    },
  };
}

function document(name: string, kind: EvidenceEntry['kind'], mediaType: string, text: string, uploadedAt: string, id: number): FixtureFile {
  const bytes = Buffer.from(text, 'utf8');
  return {
    bytes,
    entry: {
      id,
      kind,
      originalName: name,
      mediaType,
      size: bytes.length,
      sha256: createHash('sha256').update(bytes).digest('hex'),
      uploadedBy: AUTHOR,
      uploadedAt,
    },
  };
}

function checkChanges(before: DischargeResult, after: DischargeResult): ChangedCheck[] {
  const ids = [...new Set([...before.checks, ...after.checks].map((c) => c.id))];
  return ids.flatMap((id) => {
    const a = before.checks.find((c) => c.id === id) ?? null;
    const b = after.checks.find((c) => c.id === id) ?? null;
    if (a && b && a.pass === b.pass && a.value === b.value) return [];
    return [
      {
        id,
        label: (b ?? a)!.label,
        fromPass: a?.pass ?? null,
        toPass: b?.pass ?? null,
        from: a?.value ?? null,
        to: b?.value ?? null,
        unit: (b ?? a)!.unit,
      },
    ];
  });
}

const NOTES_R2 = [
  '## Design',
  '- **Bleeder:** 3 strings of 3 × 7.5 kΩ, 10 W wirewound (the suggestion of the engine).',
  '- **Balancing:** the bleeder string doubles as the balancing network.',
  '',
  'Captures: three units from the pilot lot, disconnected at the mains peak with the relay marker on `CH2`.',
].join('\n');
const NOTES_DIFF = [
  '--- revision 1',
  '+++ revision 2',
  '@@ -1,2 +1,3 @@',
  ' ## Design',
  '-- **Bleeder:** 2 strings of 4 × 4.7 kΩ, 10 W wirewound.',
  '+- **Bleeder:** 3 strings of 3 × 7.5 kΩ, 10 W wirewound (the suggestion of the engine).',
  ' - **Balancing:** the bleeder string doubles as the balancing network.',
  '+',
  '+Captures: three units from the pilot lot, disconnected at the mains peak with the relay marker on `CH2`.',
].join('\n');

export interface FixtureOptions {
  status: RevisionStatus;
  signerKind?: 'development' | 'organisation';
  signerSubject?: string;
  /** The signer's time-stamping authority; null signs without trusted time. */
  timestampAuthority?: string | null;
  /** Points per waveform trace (the analysis keeps at most 2 000). */
  tracePoints?: number;
  /**
   * A fuller dossier, as a mature product's would be: two snubbers in the design, the test procedure in
   * the notes and a dozen more supporting documents (the benchmark's ten-page case).
   */
  full?: boolean;
}

const SNUBBERS: NonNullable<DesignDraft['snubbers']> = [
  {
    name: 'Brake chopper IGBT',
    location: 'Q7 collector to emitter',
    kind: 'rc',
    resistance: 22,
    capacitance: 2.2e-9,
    capacitanceTolerance: 0.1,
    powerRating: 15,
    derating: 0.6,
    capacitorVoltageRating: 1000,
    switchingVoltage: 622,
    overshoot: 0.25,
    switchingFrequency: 8e3,
    accessible: false,
    parasiticInductance: 0.5e-6,
  },
  {
    name: 'Auxiliary flyback clamp',
    location: 'T2 primary',
    kind: 'rcd-clamp',
    resistance: 47e3,
    capacitance: 4.7e-9,
    capacitanceTolerance: 0.1,
    powerRating: 1,
    derating: 0.5,
    capacitorVoltageRating: 630,
    switchingVoltage: 622,
    overshoot: 0.3,
    switchingFrequency: 65e3,
    accessible: false,
    leakageInductance: 8e-6,
    peakCurrent: 0.6,
    clampVoltage: 180,
    reflectedVoltage: 110,
  },
];

const PROCEDURE = [
  '### Test procedure (pilot lot, three units)',
  '1. Supply at 440 V three-phase (rated +10 %) through the disconnect relay K1; the drive enabled and idle.',
  '2. Differential probe 100:1 across the DC link (X3:+DC to X3:−DC), DC coupling, 20 MHz bandwidth limit.',
  '3. CH2 on the auxiliary contact of K1 marks the disconnection; trigger on its falling edge, 5 % pre-trigger.',
  '4. Open K1 at the mains peak (peak-switching controller), record 10 s at 200 samples per second.',
  '5. Repeat with the brake chopper disabled, and with one bleeder string removed (single fault) — see the report.',
  '',
  'Instruments: recorder DR-4 (calibrated 2024-11-02), probe DP-100 (calibrated 2024-10-18).',
  'Ambient 23 °C ± 2 °C. Capacitor bank from lot C-2409, measured 221 µF per unit at 100 Hz.',
].join('\n');

/** Revision 2 of the servo-drive dossier in the given state, with three captures and two documents. */
export function servoDriveDossier(options: FixtureOptions): Fixture {
  const points = options.tracePoints ?? 2000;
  const r1 = computeDischarge({ requirement: REQUIREMENT, design: DESIGN_R1 });
  const design = options.full ? { ...DESIGN_R2, snubbers: SNUBBERS } : DESIGN_R2;
  const notes = options.full ? `${NOTES_R2}\n\n${PROCEDURE}` : NOTES_R2;
  const files: FixtureFile[] = [
    capture({ name: 'pilot-unit-01-discharge.csv', v0: 619.4, tau: 1.712, seed: 11, t0Source: 'marker' }, points, '2025-03-11T09:14:05Z', 31),
    capture({ name: 'pilot-unit-02-discharge.csv', v0: 612.8, tau: 1.684, seed: 22, t0Source: 'marker' }, points, '2025-03-11T09:41:37Z', 32),
    capture({ name: 'pilot-unit-03-discharge.csv', v0: 620.9, tau: 1.746, seed: 33, t0Source: 'detected' }, points, '2025-03-11T10:02:50Z', 33),
    document(
      'bleeder-resistor-datasheet.pdf',
      'datasheet',
      'application/pdf',
      '%PDF-1.4\n% demo datasheet: 7.5 kΩ 10 W wirewound\n',
      '2025-03-10T15:20:00Z',
      34,
    ),
    document('test-setup-photo.jpg', 'image', 'image/jpeg', 'demo image bytes: bench set-up with differential probe', '2025-03-11T08:55:12Z', 35),
  ];
  if (options.full) {
    const extras: Array<[string, EvidenceEntry['kind'], string]> = [
      ['capacitor-bank-datasheet.pdf', 'datasheet', 'application/pdf'],
      ['bleeder-derating-curve.pdf', 'datasheet', 'application/pdf'],
      ['dc-link-layout-extract.pdf', 'other', 'application/pdf'],
      ['schematic-sheet-4-power-stage.pdf', 'other', 'application/pdf'],
      ['bom-extract-discharge-parts.csv', 'other', 'text/csv'],
      ['single-fault-open-bleeder-report.pdf', 'report', 'application/pdf'],
      ['brake-chopper-disabled-report.pdf', 'report', 'application/pdf'],
      ['recorder-calibration-certificate.pdf', 'report', 'application/pdf'],
      ['probe-calibration-certificate.pdf', 'report', 'application/pdf'],
      ['terminal-cover-photo.jpg', 'image', 'image/jpeg'],
      ['warning-label-photo.jpg', 'image', 'image/jpeg'],
      ['thermal-image-bleeder-at-70C.png', 'image', 'image/png'],
      ['creepage-clearance-measurements.pdf', 'report', 'application/pdf'],
      ['bleeder-pulse-load-test.pdf', 'report', 'application/pdf'],
      ['pilot-unit-01-open-bleeder.csv', 'other', 'text/csv'],
      ['pilot-unit-02-open-bleeder.csv', 'other', 'text/csv'],
      ['pilot-unit-03-open-bleeder.csv', 'other', 'text/csv'],
      ['risk-assessment-extract.pdf', 'report', 'application/pdf'],
      ['user-manual-safety-chapter.pdf', 'other', 'application/pdf'],
      ['service-manual-discharge-wait.pdf', 'other', 'application/pdf'],
      ['bleeder-resistor-qualification.pdf', 'report', 'application/pdf'],
      ['capacitor-leakage-measurements.csv', 'other', 'text/csv'],
      ['capacitor-ageing-estimate.pdf', 'report', 'application/pdf'],
      ['enclosure-ipxxb-test.pdf', 'report', 'application/pdf'],
      ['label-artwork-residual-voltage.pdf', 'other', 'application/pdf'],
      ['pilot-lot-serial-numbers.csv', 'other', 'text/csv'],
    ];
    extras.forEach(([name, kind, mediaType], i) => {
      files.push(
        document(name, kind, mediaType, `demo content of ${name}\n`.repeat(40 + i * 17), `2025-03-1${i % 2}T1${i % 10}:0${i % 6}:00Z`, 40 + i),
      );
    });
  }
  const r2 = computeRevisionResults(
    REQUIREMENT,
    design,
    files
      .filter((f) => f.entry.analysis)
      .map((f) => ({ evidenceId: Number(f.entry.id), sha256: f.entry.sha256, name: f.entry.originalName, analysis: f.entry.analysis! })),
  );
  const contentHash = createHash('sha256')
    .update(JSON.stringify({ design, notes, evidence: files.map((f) => f.entry.sha256) }))
    .digest('hex');
  const submitted = options.status !== 'draft';
  const decided = options.status === 'approved' || options.status === 'returned';
  const returnedR1 = {
    revisionNumber: 1,
    reviewer: REVIEWER,
    decision: 'return' as const,
    comment: 'Revision 1: worst-case discharge time exceeds 5 s. Returned for a faster bleeder.',
    contentHash: createHash('sha256').update('revision 1').digest('hex'),
    at: '2025-03-07T16:02:00Z',
  };
  const reviews: DossierPdfModel['reviews'] = [];
  if (decided) {
    reviews.push({
      revisionNumber: 2,
      reviewer: REVIEWER,
      decision: options.status === 'approved' ? 'approve' : 'return',
      comment:
        options.status === 'approved'
          ? 'Worst case 4.74 s against 5 s; captures on three pilot units agree with the nominal curve. Approved.'
          : 'Please attach the capture with the bleeder open (single fault) before approval.',
      contentHash,
      at: '2025-03-12T11:30:00Z',
    });
  }
  const model: DossierPdfModel = {
    organisation: 'Fennel Grid Labs',
    product: { name: 'Servo drive SD-400', modelNumber: 'FGL-SD400-22', description: '400 V three-phase servo drive, 22 kW, DC-link 2 × 2 × 220 µF' },
    dossier: { id: 7, title: 'DC-link discharge after mains disconnection', requirement: REQUIREMENT },
    revision: {
      id: 18,
      number: 2,
      status: options.status,
      author: AUTHOR,
      createdAt: '2025-03-10T08:00:00Z',
      submittedAt: submitted ? '2025-03-11T12:00:00Z' : null,
      decidedAt: decided ? '2025-03-12T11:30:00Z' : null,
      notes,
      design,
      results: r2,
      contentHash,
    },
    evidence: files.map((f) => f.entry),
    diff: {
      against: { id: 17, number: 1 },
      inputs: [
        { path: 'design.bleeder.resistance', label: 'Resistance per resistor', from: 4.7e3, to: 7.5e3, unit: 'Ω', changePct: 59.57 },
        { path: 'design.bleeder.series', label: 'Resistors in series per string', from: 4, to: 3, unit: '', changePct: -25 },
        { path: 'design.bleeder.parallel', label: 'Strings in parallel', from: 2, to: 3, unit: '', changePct: 50 },
        ...(options.full
          ? SNUBBERS.map((sn, i) => ({
              path: `design.snubbers.${i}`,
              label: `Snubber “${sn.name}”`,
              from: null,
              to: 'added',
              unit: '',
              changePct: null,
            }))
          : []),
      ],
      checks: checkChanges(r1, r2),
      notesDiff: options.full
        ? `${NOTES_DIFF}\n+\n${PROCEDURE.split('\n')
            .map((line) => `+${line}`)
            .join('\n')}`
        : NOTES_DIFF,
      evidenceAdded: files.slice(0, 3).map((f) => ({ originalName: f.entry.originalName, sha256: f.entry.sha256 })),
      evidenceRemoved: [],
    },
    reviews: [returnedR1, ...reviews],
    audit: {
      verified: true,
      events: auditTrail(options.status, files),
      headHash: createHash('sha256').update('head').digest('hex'),
      firstBroken: null,
    },
    signer: {
      kind: options.signerKind ?? 'development',
      subject: options.signerSubject ?? 'CN=Voltfall development signing (not for certification), O=Voltfall development',
      timestampAuthority: options.timestampAuthority === undefined ? 'http://127.0.0.1/ (local development authority)' : options.timestampAuthority,
    },
    generatedAt: '2025-03-12T11:30:05Z',
  };
  return { model, files };
}

/** The dossier's story as its audit chain tells it: two revisions, uploads, submissions, decisions. */
function auditTrail(status: RevisionStatus, files: readonly FixtureFile[]): AuditEntry[] {
  const events: Array<Omit<AuditEntry, 'id' | 'hash' | 'sentence'>> = [
    { at: '2025-03-03T09:12:00Z', actor: AUTHOR.name, action: 'dossier.create', revisionNumber: null, payload: {} },
    { at: '2025-03-03T09:12:00Z', actor: AUTHOR.name, action: 'revision.create', revisionNumber: 1, payload: { number: 1 } },
    { at: '2025-03-05T14:40:00Z', actor: AUTHOR.name, action: 'revision.update', revisionNumber: 1, payload: { fields: ['design', 'notes'] } },
    { at: '2025-03-06T10:05:00Z', actor: AUTHOR.name, action: 'revision.submit', revisionNumber: 1, payload: {} },
    { at: '2025-03-07T16:02:00Z', actor: REVIEWER.name, action: 'revision.returned', revisionNumber: 1, payload: {} },
    { at: '2025-03-10T08:00:00Z', actor: AUTHOR.name, action: 'revision.create', revisionNumber: 2, payload: { number: 2, createdFrom: 17 } },
    { at: '2025-03-10T08:20:00Z', actor: AUTHOR.name, action: 'revision.update', revisionNumber: 2, payload: { fields: ['design'] } },
    ...files.map((f) => ({
      at: String(f.entry.uploadedAt),
      actor: AUTHOR.name,
      action: 'evidence.add',
      revisionNumber: 2,
      payload: { name: f.entry.originalName },
    })),
    { at: '2025-03-11T11:50:00Z', actor: AUTHOR.name, action: 'revision.update', revisionNumber: 2, payload: { fields: ['notes'] } },
  ];
  if (status !== 'draft') events.push({ at: '2025-03-11T12:00:00Z', actor: AUTHOR.name, action: 'revision.submit', revisionNumber: 2, payload: {} });
  if (status === 'returned')
    events.push({ at: '2025-03-12T11:30:00Z', actor: REVIEWER.name, action: 'revision.returned', revisionNumber: 2, payload: {} });
  return events
    .sort((a, b) => String(a.at).localeCompare(String(b.at)))
    .map((e, i) => ({
      ...e,
      // Revision 1 has id 17 in this story (revision 2 is created from it), revision 2 has id 18.
      sentence: auditSentence(
        {
          action: e.action,
          actorName: e.actor,
          subjectType: e.revisionNumber === null ? 'dossier' : 'revision',
          subjectId: e.revisionNumber === null ? 1 : 16 + e.revisionNumber,
          payload: e.payload,
        },
        { revisionNumber: (id) => ({ 17: 1, 18: 2 })[id] },
      ),
      id: i + 1,
      hash: createHash('sha256').update(`event ${i}`).digest('hex'),
    }));
}
