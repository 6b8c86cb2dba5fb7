import type { Knex } from 'knex';
import { computeDischarge } from '../../shared/engine';
import type { DesignDraft, Requirement } from '../../shared/schema/discharge';
import { appendAudit } from '../audit/chain';
import { decisionMeaning } from '../review/domain';
import { resultColumns, revisionContentHash } from '../revisions/store';

// The invented Fennel Grid Labs scenario: two products, dossiers in each state of the workflow.
const heronRequirement: Requirement = {
  safeVoltage: 60,
  maxTime: 600,
  maxEnergy: null,
  maxCharge: null,
  fallbackMaxTime: null,
  // Two parallel strings are there so one open resistor does not remove the bleeder: prove it, against
  // the longer wait the (invented) plan allows under a single fault.
  singleFault: true,
  singleFaultMaxTime: 1200,
  condition: 'After DC and AC disconnection, service cover removable with a tool; enclosure marked with a 10-minute wait',
  reference: 'Fennel Grid Labs compliance plan FGL-CP-017, residual voltage clause (demo)',
};

const heronDesign: DesignDraft = {
  bus: { nominalVoltage: 850, maxVoltage: 1000 },
  capacitors: { capacitance: 1.0e-3, series: 2, parallel: 3, toleranceMinus: 0.2, tolerancePlus: 0.2, ageing: 0.1 },
  bleeder: {
    resistance: 47e3,
    series: 4,
    parallel: 2,
    tolerance: 0.01,
    tcrPpmPerK: 100,
    drift: 0.01,
    powerRating: 3,
    elementVoltage: 350,
    derating: 0.6,
  },
  ambient: { min: -25, max: 70 },
  active: null,
  balancing: { leakageCurrent: 1.5e-3, capacitorVoltageRating: 550 },
};

const wrenRequirement: Requirement = {
  safeVoltage: 60,
  maxTime: 5,
  maxEnergy: null,
  maxCharge: null,
  fallbackMaxTime: null,
  singleFault: false,
  condition: 'Operator access to the DC-link terminals after mains disconnection',
  reference: 'Drive safety plan WD400, clause on residual voltage at operator-accessible terminals (demo)',
};

const wrenDesign: DesignDraft = {
  bus: { nominalVoltage: 565, maxVoltage: 747 },
  capacitors: { capacitance: 470e-6, series: 2, parallel: 2, toleranceMinus: 0.2, tolerancePlus: 0.2 },
  bleeder: {
    resistance: 68e3,
    series: 2,
    parallel: 1,
    tolerance: 0.05,
    tcrPpmPerK: 200,
    drift: 0.02,
    powerRating: 2,
    elementVoltage: 500,
    derating: 0.5,
  },
  ambient: { min: 0, max: 55 },
  active: null,
};

interface SeedRevision {
  number: number;
  status: 'draft' | 'in_review' | 'approved' | 'returned';
  design: DesignDraft;
  notes: string;
  author: string;
  decision?: { reviewer: string; decision: 'approve' | 'return'; comment: string };
}

async function seedDossier(
  trx: Knex.Transaction,
  productId: number,
  title: string,
  requirement: Requirement,
  createdBy: string,
  revisions: SeedRevision[],
): Promise<void> {
  const now = new Date().toISOString();
  const [dossier] = await trx('dossier')
    .insert({ product_id: productId, title, requirement: JSON.stringify(requirement), created_by: createdBy, created_at: now })
    .returning('id');
  await appendAudit(trx, {
    actorId: createdBy,
    action: 'dossier.create',
    subjectType: 'dossier',
    subjectId: dossier.id,
    dossierId: dossier.id,
    payload: { title },
  });
  let previous: number | null = null;
  for (const r of revisions) {
    const results = computeDischarge({ requirement, design: r.design });
    const submitted = r.status !== 'draft';
    const contentHash = submitted
      ? revisionContentHash({ dossierId: dossier.id, number: r.number, design: r.design, notes: r.notes, results, evidence: [] })
      : null;
    const [row]: Array<{ id: number }> = await trx('revision')
      .insert({
        dossier_id: dossier.id,
        number: r.number,
        status: 'draft',
        design: JSON.stringify(r.design),
        notes: r.notes,
        ...resultColumns(results),
        author_id: r.author,
        created_from: previous,
        content_hash: contentHash,
        created_at: now,
        updated_at: now,
        submitted_at: submitted ? now : null,
      })
      .returning('id');
    await appendAudit(trx, {
      actorId: r.author,
      action: 'revision.create',
      subjectType: 'revision',
      subjectId: row.id,
      dossierId: dossier.id,
      payload: { number: r.number },
    });
    if (submitted) {
      // Submission is a stored change of the draft: its version moves on, as through the API.
      await trx('revision').where({ id: row.id }).update({ status: 'in_review', version: 2 });
      await appendAudit(trx, {
        actorId: r.author,
        action: 'revision.submit',
        subjectType: 'revision',
        subjectId: row.id,
        dossierId: dossier.id,
        payload: { number: r.number, contentHash },
      });
    }
    if (r.decision) {
      const status = r.decision.decision === 'approve' ? 'approved' : 'returned';
      await trx('revision').where({ id: row.id }).update({ status, decided_at: now });
      const reviewer = await trx('user').where({ id: r.decision.reviewer }).first('name', 'role');
      await trx('review_decision').insert({
        revision_id: row.id,
        reviewer_id: r.decision.reviewer,
        decision: r.decision.decision,
        comment: r.decision.comment,
        content_hash: contentHash,
        created_at: now,
        signer_name: reviewer.name,
        signer_role: reviewer.role,
        meaning: decisionMeaning(r.decision.decision, reviewer.role),
      });
      await appendAudit(trx, {
        actorId: r.decision.reviewer,
        action: `revision.${status}`,
        subjectType: 'revision',
        subjectId: row.id,
        dossierId: dossier.id,
        payload: { comment: r.decision.comment, contentHash },
      });
    }
    previous = row.id;
  }
}

export async function seedDemoDossiers(trx: Knex.Transaction, ids: Record<string, string>): Promise<void> {
  const now = new Date().toISOString();
  const [heron] = await trx('product')
    .insert({
      name: 'Heron 1000 string inverter',
      model_number: 'FGL-HS1000-3P',
      description: '1000 V DC solar string inverter, three-phase output, 60 kW.',
      created_by: ids.engineer,
      created_at: now,
    })
    .returning('id');
  const [wren] = await trx('product')
    .insert({
      name: 'Wren 400 servo drive',
      model_number: 'FGL-WD400-7K5',
      description: '400 V three-phase servo drive, 7.5 kW, electrolytic DC link.',
      created_by: ids.engineer,
      created_at: now,
    })
    .returning('id');

  await seedDossier(trx, heron.id, 'DC-link residual voltage at service access', heronRequirement, ids.engineer, [
    {
      number: 1,
      status: 'approved',
      design: heronDesign,
      notes:
        'Bleeders double as balancing resistors for the two series electrolytics.\nTwo parallel strings so one open resistor does not remove the bleeder.\n',
      author: ids.engineer,
      decision: { reviewer: ids.reviewer, decision: 'approve', comment: 'Worst-case corner and resistor stress checked against the BOM.' },
    },
    {
      number: 2,
      status: 'draft',
      design: { ...heronDesign, bleeder: { ...heronDesign.bleeder!, resistance: 56e3 } },
      notes:
        'Bleeders double as balancing resistors for the two series electrolytics.\nTwo parallel strings so one open resistor does not remove the bleeder.\nRev 2: 56 kΩ parts from the second source; check the time margin.\n',
      author: ids.engineer,
    },
  ]);

  await seedDossier(trx, wren.id, 'Residual voltage at operator-accessible DC terminals', wrenRequirement, ids.engineer2, [
    {
      number: 1,
      status: 'in_review',
      design: wrenDesign,
      notes: 'Initial calculation for the 480 V variant (747 V peak bus).\n',
      author: ids.engineer2,
    },
  ]);

  await seedDossier(
    trx,
    wren.id,
    'Plug pins after withdrawal (auxiliary supply)',
    {
      ...wrenRequirement,
      maxTime: 1,
      condition: 'Auxiliary supply plug withdrawn; pins exposed',
      reference: 'Drive safety plan WD400, plug-pin clause (demo)',
    },
    ids.engineer,
    [
      {
        number: 1,
        status: 'returned',
        // The same drive's auxiliary supply input: its X capacitor and bleed, in the drive's ambient.
        design: {
          ...wrenDesign,
          bus: { nominalVoltage: 325, maxVoltage: 358 },
          capacitors: { capacitance: 2.2e-6, series: 1, parallel: 1, toleranceMinus: 0.1, tolerancePlus: 0.1 },
          bleeder: { ...wrenDesign.bleeder!, resistance: 470e3, tolerance: 0.01, tcrPpmPerK: 100, drift: 0, powerRating: 0.25, elementVoltage: 200 },
        },
        notes: 'X-capacitor bleed on the auxiliary supply input.\n',
        author: ids.engineer,
        decision: {
          reviewer: ids.reviewer,
          decision: 'return',
          comment: 'The plug-pin limit is 1 s; the worst case is above it. Lower R or split the string.',
        },
      },
    ],
  );
}
