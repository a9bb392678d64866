/**
 * Rotamer verdicts from our chi-space densities.
 *  - Staggered side chains are the energy minima and eclipsed ones the maxima of the chi1 torsion
 *    (common practice, no source): for every type, the best staggered well (+60°, 180°, −60°) is
 *    favored and chi1 = 0° (eclipsed on N) is an outlier.
 *  - On the fixed 200-file subset of the reference set (skipped with a message only when that
 *    folder is absent), the reference residues themselves fall below the 0.3 % outlier cut about
 *    0.3 % of the time and inside favored (≥ 2 %) about 98 % of the time — the contours are placed
 *    where Lovell et al.'s method puts them (density levels by data fraction).
 */
import * as fs from 'fs';
import * as path from 'path';
import { DEFAULT_REFERENCE_FOLDER } from '../src/cli/build-reference';
import { readStructure } from '../src/io/read';
import { defaultReference, loadReference } from '../src/reference';
import type { ReferenceArtefact } from '../src/reference/artefact';
import { collectObservations, emptyObservations } from '../src/reference/build';
import { ROTAMER_CHI_USED, chiWellName, rotamerVerdict } from '../src/validation/rotamer';

const DATA = path.join(__dirname, '../src/reference/data');

describe('rotamer verdicts', () => {
  const ref = defaultReference();
  it.each(Object.keys(ROTAMER_CHI_USED))(
    '%s: best staggered chi1 well favored, eclipsed chi1 = 0° an outlier',
    (type) => {
      const used = ROTAMER_CHI_USED[type];
      const look = ref.rotamer.get(type)!;
      // best chi2 for each chi1 well, scanned on a 10° grid
      const best = (chi1: number): number => {
        if (used === 1) return look.lnAt(chi1);
        let b = -Infinity;
        for (let c2 = -180; c2 < 180; c2 += 10) b = Math.max(b, look.lnAt(chi1, c2));
        return b;
      };
      const wells = [60, 180, -60].map((c) => ({ c, ln: best(c) })).sort((a, b) => b.ln - a.ln);
      let chi2 = 0;
      if (used === 2) {
        let b = -Infinity;
        for (let c2 = -180; c2 < 180; c2 += 10)
          if (look.lnAt(wells[0].c, c2) > b) [b, chi2] = [look.lnAt(wells[0].c, c2), c2];
      }
      expect(rotamerVerdict(ref, type, [wells[0].c, chi2])!.verdict).toBe('favored');
      expect(rotamerVerdict(ref, type, [0, chi2])!.verdict).toBe('outlier');
    },
  );

  it('names chi wells p/t/m', () => {
    expect(chiWellName([62, -178])).toBe('pt');
    expect(chiWellName([-65])).toBe('m');
  });
});

const haveSet = fs.existsSync(DEFAULT_REFERENCE_FOLDER);
if (!haveSet)
  console.warn(
    `SKIPPED: ${DEFAULT_REFERENCE_FOLDER} is absent, so the rotamer contour test cannot run.`,
  );
(haveSet ? describe : describe.skip)('rotamer contours on the 200-file reference subset', () => {
  it('≈ 0.3 % of reference side chains are outliers and ≈ 98 % favored', async () => {
    const artefact = JSON.parse(
      fs.readFileSync(path.join(DATA, 'reference-subset-200.json'), 'utf8'),
    ) as ReferenceArtefact;
    const ref = loadReference(artefact);
    const names = fs
      .readFileSync(path.join(DATA, 'subset-200.txt'), 'utf8')
      .split('\n')
      .filter((l) => l && !l.startsWith('#'));
    const obs = emptyObservations();
    for (const n of names)
      collectObservations(
        await readStructure(fs.readFileSync(path.join(DEFAULT_REFERENCE_FOLDER, n)), n),
        obs,
      );
    let total = 0;
    let outliers = 0;
    let favored = 0;
    for (const [type, flat] of Object.entries(obs.rotamer)) {
      const used = ROTAMER_CHI_USED[type];
      for (let i = 0; i < flat.length; i += used) {
        const v = rotamerVerdict(ref, type, flat.slice(i, i + used))!;
        total++;
        if (v.verdict === 'outlier') outliers++;
        if (v.verdict === 'favored') favored++;
      }
    }
    expect(total).toBeGreaterThan(20000);
    expect((100 * outliers) / total).toBeGreaterThan(0.15);
    expect((100 * outliers) / total).toBeLessThan(0.45);
    expect(Math.abs((100 * favored) / total - 98)).toBeLessThan(0.3);
  });
});
