import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoDesign, demoRequirement, failingDesign } from '../support/fixtures';
import { DEMO_PASSWORD, saveDraft, startTestServer, type TestServer } from '../support/test-server';

let server: TestServer;
beforeAll(async () => {
  server = await startTestServer();
});
afterAll(() => server.close());

async function newDossier(title = 'DC-link discharge after mains disconnection') {
  const engineer = await server.signIn('engineer');
  const products = (await engineer.get('/api/products')).body;
  const res = await engineer.post('/api/dossiers').send({ productId: products[0].id, title, requirement: demoRequirement });
  expect(res.status).toBe(201);
  return { engineer, dossier: res.body, draftId: res.body.revisions[0].id as number };
}

describe('the life of a revision', () => {
  it('when an engineer creates a dossier, then revision 1 is an empty draft whose verdict is incomplete', async () => {
    const { dossier } = await newDossier();
    expect(dossier.revisions).toHaveLength(1);
    expect(dossier.revisions[0]).toMatchObject({ number: 1, status: 'draft', verdict: 'incomplete' });
  });

  it('when the author saves the design, then the server recomputes and stores the results with the engine version', async () => {
    const { engineer, draftId } = await newDossier();
    const res = await saveDraft(engineer, draftId, { design: demoDesign, notes: 'First cut.' });
    expect(res.status).toBe(200);
    expect(res.body.results.engineVersion).toMatch(/^\d+\.\d+\.\d+$/);
    expect(['meets', 'fails']).toContain(res.body.results.verdict);
    expect(res.body.results.checks.map((c: { id: string }) => c.id)).toContain('discharge-time');
  });

  it('when a reviewer returns a revision, then the author is e-mailed with the comment and the revision is frozen', async () => {
    const { engineer, draftId } = await newDossier('Return story');
    await saveDraft(engineer, draftId, { design: demoDesign });
    const submitted = await engineer.post(`/api/revisions/${draftId}/submit`);
    expect(submitted.status).toBe(200);
    expect(submitted.body.status).toBe('in_review');
    expect(submitted.body.contentHash).toMatch(/^[0-9a-f]{64}$/);

    const toReviewer = await server.waitForMail((m) => m.to.includes('reviewer@fennel.test') && m.subject.includes('Return story'));
    expect(toReviewer.subject).toMatch(/Revision 1 of "Return story" awaits review/);
    expect(toReviewer.text).toContain(`/revisions/${draftId}`);
    expect(toReviewer.html).toContain('<a href=');

    const reviewer = await server.signIn('reviewer');
    const noComment = await reviewer.post(`/api/revisions/${draftId}/decision`).send({ decision: 'return', comment: '' });
    expect(noComment.status).toBe(400);
    expect(noComment.body.error.fields[0].path).toBe('comment');

    const returned = await reviewer
      .post(`/api/revisions/${draftId}/decision`)
      .send({ decision: 'return', comment: 'Use the 85 °C TCR corner for R.' });
    expect(returned.status).toBe(200);
    expect(returned.body.status).toBe('returned');
    const toAuthor = await server.waitForMail((m) => m.to.includes('engineer@fennel.test') && m.subject.includes('Return story'));
    expect(toAuthor.subject).toMatch(/was returned/);
    expect(toAuthor.text).toContain('Use the 85 °C TCR corner for R.');

    const edit = await saveDraft(engineer, draftId, { notes: 'sneaky edit' });
    expect(edit.status).toBe(409);
    expect(edit.body.error.message).toMatch(/frozen/);
  });

  it('when the engineer starts revision 2 and changes a resistor, then the diff shows the change in units and the approval freezes it', async () => {
    const { engineer, dossier, draftId } = await newDossier('Diff story');
    await saveDraft(engineer, draftId, { design: demoDesign, notes: 'Line one\nLine two\n' });
    await engineer.post(`/api/revisions/${draftId}/submit`);
    const reviewer = await server.signIn('reviewer');
    await reviewer.post(`/api/revisions/${draftId}/decision`).send({ decision: 'return', comment: 'Bleeder too slow.' });

    const second = await engineer.post(`/api/dossiers/${dossier.id}/revisions`).send({ fromRevisionId: draftId });
    expect(second.status).toBe(201);
    expect(second.body).toMatchObject({ number: 2, status: 'draft', createdFrom: draftId });
    expect(second.body.design).toEqual(expect.objectContaining({ bleeder: demoDesign.bleeder }));

    const another = await engineer.post(`/api/dossiers/${dossier.id}/revisions`).send({});
    expect(another.status).toBe(409);

    const design2 = { ...demoDesign, bleeder: { ...demoDesign.bleeder, resistance: 68_000 } };
    await saveDraft(engineer, second.body.id, { design: design2, notes: 'Line one\nLine 2 changed\n' });
    const diff = await engineer.get(`/api/revisions/${second.body.id}/diff`);
    expect(diff.status).toBe(200);
    expect(diff.body.against.number).toBe(1);
    const r = diff.body.inputs.find((c: { path: string }) => c.path === 'bleeder.resistance');
    expect(r).toMatchObject({ label: 'Resistance per resistor', from: '100 kΩ', to: '68 kΩ' });
    expect(r.changePct).toBeCloseTo(-32, 6);
    expect(diff.body.notes.changed).toBe(true);
    expect(diff.body.notes.parts.some((p: { added: boolean; value: string }) => p.added && p.value.includes('Line 2 changed'))).toBe(true);
    const time = diff.body.checks.find((c: { id: string }) => c.id === 'discharge-time');
    expect(time.to.value).toBeLessThan(time.from.value);

    await engineer.post(`/api/revisions/${second.body.id}/submit`);
    const approved = await reviewer
      .post(`/api/revisions/${second.body.id}/decision`)
      .send({ decision: 'approve', comment: 'Meets the limit with margin.', password: DEMO_PASSWORD });
    expect(approved.status).toBe(200);
    expect(approved.body.status).toBe('approved');
    expect(approved.body.decision).toMatchObject({
      decision: 'approve',
      reviewer: { email: 'reviewer@fennel.test' },
      signerName: 'Marta Kowalczyk',
      signerRole: 'reviewer',
      meaning: 'approved as reviewer',
    });
    expect(approved.body.decision.contentHash).toBe(approved.body.contentHash);
  });
});

describe('snubbers across revisions', () => {
  it('when a snubber resistor changes in revision 2, then the diff names the snubber and shows the values in units', async () => {
    const { engineer, dossier, draftId } = await newDossier('Snubber diff');
    const snubber = {
      name: 'R12/C7',
      location: 'across Q3',
      kind: 'rc',
      resistance: 82,
      capacitance: 330e-12,
      capacitanceTolerance: 0.1,
      powerRating: 0.5,
      derating: 0.6,
      capacitorVoltageRating: 100,
      switchingVoltage: 48,
      overshoot: 0.3,
      switchingFrequency: 250e3,
      accessible: false,
      parasiticInductance: 633e-9,
      parasiticCapacitance: 100e-12,
    };
    const first = await saveDraft(engineer, draftId, { design: { ...demoDesign, snubbers: [snubber] } });
    expect(first.body.results.checks.map((c: { id: string }) => c.id)).toContain('snubber-power:0');
    await engineer.post(`/api/revisions/${draftId}/submit`);
    const reviewer = await server.signIn('reviewer');
    await reviewer.post(`/api/revisions/${draftId}/decision`).send({ decision: 'return', comment: 'Damping below 0.5 at C−.' });
    const second = (await engineer.post(`/api/dossiers/${dossier.id}/revisions`).send({})).body;
    await saveDraft(engineer, second.id, { design: { ...demoDesign, snubbers: [{ ...snubber, resistance: 100 }] } });
    const diff = (await engineer.get(`/api/revisions/${second.id}/diff`)).body;
    expect(diff.inputs).toEqual([
      expect.objectContaining({ path: 'snubbers[0].resistance', label: 'Snubber R12/C7: resistance', from: '82 Ω', to: '100 Ω' }),
    ]);
  });

  it('when a snubber is half typed, then the draft still saves and the verdict is incomplete', async () => {
    const { engineer, draftId } = await newDossier('Half-typed snubber');
    const res = await saveDraft(engineer, draftId, { design: { ...demoDesign, snubbers: [{ kind: 'rc', name: 'R5', resistance: 47 }] } });
    expect(res.status).toBe(200);
    expect(res.body.results.verdict).toBe('incomplete');
    expect(res.body.results.missing).toContain('design.snubbers.0.capacitance');
  });
});

describe('separation of duties and permissions', () => {
  it('when a reviewer authored a revision, then they cannot decide on it', async () => {
    // The demo reviewer is promoted to engineer for a moment to author a revision.
    const admin = await server.signIn('admin');
    const users = (await admin.get('/api/users')).body as Array<{ id: string; email: string }>;
    const reviewerUser = users.find((u) => u.email === 'reviewer@fennel.test')!;
    await admin.patch(`/api/users/${reviewerUser.id}`).send({ role: 'engineer' });
    const asEngineer = await server.signIn('reviewer');
    const products = (await asEngineer.get('/api/products')).body;
    const created = await asEngineer.post('/api/dossiers').send({ productId: products[0].id, title: 'Self review', requirement: demoRequirement });
    const revId = created.body.revisions[0].id;
    await saveDraft(asEngineer, revId, { design: demoDesign });
    await asEngineer.post(`/api/revisions/${revId}/submit`);
    await admin.patch(`/api/users/${reviewerUser.id}`).send({ role: 'reviewer' });

    const asReviewer = await server.signIn('reviewer');
    const res = await asReviewer.post(`/api/revisions/${revId}/decision`).send({ decision: 'approve', comment: '', password: DEMO_PASSWORD });
    expect(res.status).toBe(403);
    expect(res.body.error.message).toMatch(/separation of duties/);
  });

  it("when another engineer edits someone else's draft, then 403; a viewer cannot create anything", async () => {
    const { draftId } = await newDossier('Ownership');
    const other = await server.signIn('engineer2');
    const res = await saveDraft(other, draftId, { notes: 'not mine' });
    expect(res.status).toBe(403);
    const viewer = await server.signIn('viewer');
    expect((await viewer.post('/api/products').send({ name: 'x', modelNumber: 'y' })).status).toBe(403);
  });

  it('when a revision fails a check, then it cannot be approved, only returned', async () => {
    const { engineer, draftId } = await newDossier('Failing');
    await saveDraft(engineer, draftId, { design: failingDesign });
    await engineer.post(`/api/revisions/${draftId}/submit`);
    const reviewer = await server.signIn('reviewer');
    const res = await reviewer
      .post(`/api/revisions/${draftId}/decision`)
      .send({ decision: 'approve', comment: 'looks fine', password: DEMO_PASSWORD });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/cannot be approved: it fails Bleeder resistor dissipation/);
    expect((await engineer.get(`/api/revisions/${draftId}`)).body.status).toBe('in_review');
  });

  it('when two reviewers decide at the same moment, then exactly one wins and the other gets 409', async () => {
    const { engineer, draftId } = await newDossier('Race');
    await saveDraft(engineer, draftId, { design: demoDesign });
    await engineer.post(`/api/revisions/${draftId}/submit`);
    const a = await server.signIn('reviewer');
    const b = await server.signIn('reviewer');
    const results = await Promise.all([
      a.post(`/api/revisions/${draftId}/decision`).send({ decision: 'approve', comment: 'A', password: DEMO_PASSWORD }),
      b.post(`/api/revisions/${draftId}/decision`).send({ decision: 'return', comment: 'B' }),
    ]);
    expect(results.map((r) => r.status).sort()).toEqual([200, 409]);
  });

  it('when design inputs are nonsense, then 400 names each field and nothing is saved', async () => {
    const { engineer, draftId } = await newDossier('Bad input');
    const before = (await engineer.get(`/api/revisions/${draftId}`)).body;
    const res = await saveDraft(engineer, draftId, {
      design: { ...demoDesign, capacitors: { ...demoDesign.capacitors, capacitance: -1 }, bleeder: { ...demoDesign.bleeder, resistance: 'lots' } },
    });
    expect(res.status).toBe(400);
    const paths = res.body.error.fields.map((f: { path: string }) => f.path);
    expect(paths).toEqual(expect.arrayContaining(['design.capacitors.capacitance', 'design.bleeder.resistance']));
    const after = (await engineer.get(`/api/revisions/${draftId}`)).body;
    expect(after.updatedAt).toBe(before.updatedAt);
  });
});

describe('frozen in the database itself', () => {
  it('when someone updates or deletes a submitted revision with SQL, then the database refuses', async () => {
    const { engineer, draftId } = await newDossier('Direct SQL');
    await saveDraft(engineer, draftId, { design: demoDesign });
    await engineer.post(`/api/revisions/${draftId}/submit`);
    // SQL sent past the API (the app's own connection, SQLite or PostgreSQL): the triggers refuse it.
    const db = server.ctx.db;
    await expect(db.raw("UPDATE revision SET notes = 'tampered' WHERE id = ?", [draftId])).rejects.toThrow(/frozen/);
    await expect(db.raw("UPDATE revision SET status = 'draft' WHERE id = ?", [draftId])).rejects.toThrow(/frozen/);
    await expect(db.raw('DELETE FROM revision WHERE id = ?', [draftId])).rejects.toThrow(/frozen/);
    await expect(
      db.raw(
        "INSERT INTO evidence (revision_id, kind, original_name, media_type, size, sha256, storage_key, uploaded_by, uploaded_at) VALUES (?, 'other', 'x', 'text/plain', 1, 'x', 'x', 'x', 'x')",
        [draftId],
      ),
    ).rejects.toThrow(/frozen/);
  });
});

describe('audit trail', () => {
  it('when a row of the chain is edited directly, then verification fails naming the first broken event', async () => {
    const { dossier } = await newDossier('Audit');
    const reviewer = await server.signIn('reviewer');
    const ok = await reviewer.get(`/api/audit?dossierId=${dossier.id}`);
    expect(ok.status).toBe(200);
    expect(ok.body.verified).toBe(true);
    expect(ok.body.events.map((e: { action: string }) => e.action)).toEqual(['dossier.create', 'revision.create']);

    const target = ok.body.events[0].id;
    // Someone with write access to the database removes the guard trigger and rewrites history.
    await server.ctx.db.raw(
      server.ctx.db.client.dialect === 'postgresql' ? 'DROP TRIGGER audit_event_no_update ON audit_event' : 'DROP TRIGGER audit_event_no_update',
    );
    await server.ctx.db.raw('UPDATE audit_event SET payload = \'{"title":"forged"}\' WHERE id = ?', [target]);
    const broken = await reviewer.get(`/api/audit?dossierId=${dossier.id}`);
    expect(broken.body.verified).toBe(false);
    expect(broken.body.firstBroken.id).toBe(target);
  });
});
