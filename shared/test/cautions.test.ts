/**
 * Plain-language cautions (src/report/cautions.ts). The faults are planted by the demo builder
 * at known places (an independent construction), the refinement rules of thumb are those of the
 * design notes (common practice, no source), and the CA-only case is the real entry 1LZH.
 */
import * as fs from 'fs';
import * as path from 'path';
import { buildDemoStructures, buildReport, reportCautions } from '../src';
import type { Report } from '../src';
import { FIXTURES } from './reference/reference';

const enc = new TextEncoder();

async function reportOf(file: string): Promise<Report> {
  return buildReport(new Uint8Array(fs.readFileSync(path.join(FIXTURES, file))), {
    filename: file,
  });
}

describe('cautions', () => {
  test('every planted demo fault is named in plain words', async () => {
    for (const demo of buildDemoStructures()) {
      const report = await buildReport(enc.encode(demo.cif), { filename: demo.fileName });
      const text = report.cautions.join('\n');
      for (const f of demo.faults) {
        if (f.kind === 'cis-peptide')
          expect(text).toMatch(/1 cis peptide\(s\) before a residue other than proline/);
        if (f.kind === 'd-residue')
          expect(text).toMatch(/1 residue\(s\) have D \(inverted\) handedness/);
        if (f.kind === 'stretched-bond')
          expect(text).toMatch(/[1-9]\d* bond length\(s\) .* more than 4σ/);
      }
      // a fault the builder did not plant is not claimed
      if (!demo.faults.some((f) => f.kind === 'd-residue')) expect(text).not.toMatch(/handedness/);
      if (!demo.faults.some((f) => f.kind === 'cis-peptide'))
        expect(text).not.toMatch(/cis peptide/);
    }
  });

  test('a CA-only model (1LZH) says which statistics could not be computed', async () => {
    const report = await reportOf('1lzh.pdb.gz');
    const notComputed = report.cautions.filter((c) => c.startsWith('Not computed:'));
    expect(notComputed.length).toBeGreaterThan(0);
    expect(notComputed.join(' ')).toMatch(/CA atoms only/);
  });

  test('R-free rules of thumb fire on the values read from the file, and only then', async () => {
    const report = await reportOf('1A8O.cif');
    const rWork = Number(report.experiment?.rWork?.value);
    const rFree = Number(report.experiment?.rFree?.value);
    expect(Number.isFinite(rWork) && Number.isFinite(rFree)).toBe(true);
    const gapRule = report.cautions.some((c) => c.startsWith('R-free exceeds R-work'));
    expect(gapRule).toBe(rFree - rWork > 0.05);
    // the same model with an over-fitted refinement at 1.7 Å: both rules fire
    const worse: Report = JSON.parse(JSON.stringify(report));
    worse.experiment = {
      ...worse.experiment,
      rWork: { value: 0.2, source: 'test' },
      rFree: { value: 0.34, source: 'test' },
      refineResolutionHighA: { value: 1.7, source: 'test' },
    };
    const c = reportCautions(worse);
    expect(c.some((x) => /R-free exceeds R-work by 0\.140/.test(x))).toBe(true);
    expect(c.some((x) => /R-free is 0\.340 at 1\.70 Å/.test(x))).toBe(true);
    // at 3.0 Å the same R-free is not flagged as high for the resolution
    worse.experiment.refineResolutionHighA = { value: 3.0, source: 'test' };
    expect(reportCautions(worse).some((x) => /high for data better than 2\.5 Å/.test(x))).toBe(
      false,
    );
  });
});
