import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import type { LedgerDto } from '@foldfolio/shared';
import { type Account, register, startTestApp, type TestApp } from './helpers/test-app.js';
import {
  REPO,
  createManuscript,
  fixture,
  seedVersion,
  useTempStorage,
} from './helpers/workflow.js';

let storageDir: string;
let work: string;
let t: TestApp;
let owner: Account;
let manuscriptId: string;

/**
 * An invented "refinement": 1A8O.pdb with residues A170–A172 shifted by +1.5 Å along x. The
 * peptide bonds into and out of the shifted stretch become far too long, so those residues must
 * gain covalent-geometry outliers; everything else is unchanged.
 */
function shifted(): Buffer {
  const lines = fixture('1A8O.pdb').toString('latin1').split('\n');
  const out = lines.map((l) => {
    if (!/^(ATOM {2}|HETATM)/.test(l) || l[21] !== 'A') return l;
    const seq = Number(l.slice(22, 26));
    if (seq < 170 || seq > 172) return l;
    const x = (Number(l.slice(30, 38)) + 1.5).toFixed(3).padStart(8);
    return l.slice(0, 30) + x + l.slice(38);
  });
  return Buffer.from(out.join('\n'), 'latin1');
}

beforeAll(async () => {
  storageDir = useTempStorage();
  work = mkdtempSync(join(tmpdir(), 'ff-ledger-'));
  t = await startTestApp();
  owner = await register(t, 'Owner');
  manuscriptId = await createManuscript(t, owner);
});
afterAll(async () => {
  await t?.close();
  rmSync(storageDir, { recursive: true, force: true });
  rmSync(work, { recursive: true, force: true });
  delete process.env.FOLDFOLIO_STORAGE_DIR;
});

function ledger(versionId: string, against?: string) {
  return request(t.server)
    .get(
      `/api/manuscripts/${manuscriptId}/models/${versionId}/ledger${against ? `?against=${against}` : ''}`,
    )
    .set('Authorization', `Bearer ${owner.token}`);
}

test('the first version has nothing to compare with', async () => {
  const v1 = await seedVersion(t, manuscriptId, owner.id, '1A8O.pdb');
  const res = await ledger(v1.id).expect(200);
  expect(res.body).toEqual({ ledger: null });
});

test('against the previous version: CA RMSD as gemmi computes it, new outliers where the model was moved', async () => {
  const bytes = shifted();
  const v2 = await seedVersion(t, manuscriptId, owner.id, '1A8O-shifted.pdb', bytes);
  const res = await ledger(v2.id).expect(200);
  const l = res.body.ledger as LedgerDto;
  expect(l.from.n).toBe(1);
  expect(l.to.n).toBe(2);

  const fromFile = join(work, 'from.pdb');
  const toFile = join(work, 'to.pdb');
  writeFileSync(fromFile, fixture('1A8O.pdb'));
  writeFileSync(toFile, bytes);
  // reference: gemmi 0.5 superpose_positions on the same CA pairs (python3-gemmi)
  const ref = JSON.parse(
    execFileSync('/usr/bin/python3', [
      join(REPO, 'service/test/reference/ledger_gemmi.py'),
      fromFile,
      toFile,
    ]).toString(),
  ) as { matched: number; rmsd: number };
  expect(l.matchedCa).toBe(ref.matched);
  expect(l.caRmsdA).toBeCloseTo(ref.rmsd, 4);
  expect(l.caRmsdA).toBeGreaterThan(0.1);

  // the moved stretch's ends break their peptide bonds: new covalent outliers there, and only there
  const flagged = l.newOutliers.map((c) => `${c.chain}${c.seq}`);
  expect(flagged.length).toBeGreaterThan(0);
  const covalent = l.newOutliers.filter((c) =>
    c.added.some((f) => f === 'bond-outlier' || f === 'angle-outlier'),
  );
  expect(covalent.length).toBeGreaterThan(0);
  for (const c of covalent) {
    // bonds and angles change only where the moved stretch joins the rest (overlaps may be anywhere near)
    expect(`${c.chain}${c.seq}`).toMatch(/^A(169|170|171|172|173)$/);
  }
  for (const c of l.newOutliers) expect(c.chain).toBe('A');
  expect(l.fixedOutliers).toEqual([]);
  expect(l.residuesOnlyInFrom + l.residuesOnlyInTo).toBe(0);
  const bonds = l.deltas.find((d) => d.key === 'bondRmsd');
  expect(bonds?.to).toBeGreaterThan(bonds?.from ?? Infinity);
});

test('the fix shows up as fixed outliers when the original comes back, and any pair can be compared', async () => {
  const v3 = await seedVersion(t, manuscriptId, owner.id, '1A8O.cif');
  const back = (await ledger(v3.id).expect(200)).body.ledger as LedgerDto;
  expect(back.from.n).toBe(2);
  expect(back.fixedOutliers.length).toBeGreaterThan(0);
  expect(back.newOutliers).toEqual([]);
  const versions = await request(t.server)
    .get(`/api/manuscripts/${manuscriptId}/models`)
    .set('Authorization', `Bearer ${owner.token}`)
    .expect(200);
  const v1 = versions.body.find((v: { n: number }) => v.n === 1);
  // the same coordinates in PDB and mmCIF: nothing moved, no verdict changed
  const same = (await ledger(v3.id, v1.id).expect(200)).body.ledger as LedgerDto;
  expect(same.caRmsdA).toBeLessThan(1e-6);
  expect(same.newOutliers).toEqual([]);
  expect(same.fixedOutliers).toEqual([]);
  await ledger(v3.id, v3.id).expect(400);
});
