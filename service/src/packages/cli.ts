/** `foldfolio package` (build a review package from model files) and `foldfolio verify`. */
import { readFileSync, writeFileSync } from 'node:fs';
import { basename } from 'node:path';
import { sharedVegaHost } from '../figures/vega-host.js';
import { buildPackage } from './build.js';
import { formatVerifyResult, verifyPackage } from './verify.js';

export const PACKAGE_USAGE =
  'package <model file>... [--out package.zip] [--title TEXT] [--anonymise] [--without-model]';
export const VERIFY_USAGE = 'verify <package.zip> [--model FILE] [--json]';

type Io = { out: (t: string) => void; err: (t: string) => void };

function split(
  args: string[],
  valued: string[],
): { positional: string[]; options: Map<string, string | true> } {
  const positional: string[] = [];
  const options = new Map<string, string | true>();
  for (let i = 0; i < args.length; i++) {
    const a = args[i];
    if (!a.startsWith('--')) {
      positional.push(a);
      continue;
    }
    const name = a.slice(2);
    if (valued.includes(name)) {
      const v = args[++i];
      if (v === undefined) throw new Error(`Option --${name} needs a value.`);
      options.set(name, v);
    } else options.set(name, true);
  }
  return { positional, options };
}

export async function runPackageCommand(args: string[], io: Io): Promise<number> {
  let p: ReturnType<typeof split>;
  try {
    p = split(args, ['out', 'title']);
  } catch (e) {
    io.err(`foldfolio package: ${(e as Error).message}\nusage: foldfolio ${PACKAGE_USAGE}\n`);
    return 2;
  }
  const unknown = [...p.options.keys()].filter(
    (k) => !['out', 'title', 'anonymise', 'without-model'].includes(k),
  );
  if (p.positional.length === 0 || unknown.length) {
    io.err(
      `${unknown.length ? `foldfolio package: unknown option --${unknown[0]}.\n` : ''}usage: foldfolio ${PACKAGE_USAGE}\n`,
    );
    return 2;
  }
  try {
    const models = p.positional.map((f, i) => ({
      n: i + 1,
      filename: basename(f),
      bytes: readFileSync(f),
    }));
    const out = (p.options.get('out') as string | undefined) ?? 'package.zip';
    const built = await buildPackage({
      title: (p.options.get('title') as string | undefined) ?? basename(p.positional[0]),
      models,
      includeModel: !p.options.has('without-model'),
      anonymise: p.options.has('anonymise'),
    });
    writeFileSync(out, built.zip);
    io.out(`${out}: ${built.files.size} files, ${built.zip.length} bytes\n`);
    return 0;
  } catch (e) {
    io.err(`foldfolio package: ${(e as Error).message}\n`);
    return (e as NodeJS.ErrnoException).code === 'ENOENT' ? 2 : 1;
  } finally {
    await sharedVegaHost().close();
  }
}

export async function runVerifyCommand(args: string[], io: Io): Promise<number> {
  let p: ReturnType<typeof split>;
  try {
    p = split(args, ['model']);
  } catch (e) {
    io.err(`foldfolio verify: ${(e as Error).message}\nusage: foldfolio ${VERIFY_USAGE}\n`);
    return 2;
  }
  if (p.positional.length !== 1) {
    io.err(`usage: foldfolio ${VERIFY_USAGE}\n`);
    return 2;
  }
  let zip: Buffer;
  let model: { filename: string; bytes: Buffer } | undefined;
  try {
    zip = readFileSync(p.positional[0]);
    const m = p.options.get('model');
    if (typeof m === 'string') model = { filename: basename(m), bytes: readFileSync(m) };
  } catch (e) {
    io.err(
      `foldfolio verify: cannot read ${(e as NodeJS.ErrnoException).path ?? 'the file'}; check the path.\n`,
    );
    return 2;
  }
  try {
    const r = await verifyPackage(zip, { model });
    io.out(p.options.has('json') ? JSON.stringify(r, null, 2) + '\n' : formatVerifyResult(r));
    return r.ok ? 0 : 1;
  } catch (e) {
    io.err(`foldfolio verify: ${(e as Error).message}\n`);
    return 2;
  } finally {
    await sharedVegaHost().close();
  }
}
