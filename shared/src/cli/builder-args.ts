/**
 * Command line of the data builders (`build-reference`, `build-geometry`; Node edge):
 * `[folder] [--list file] [--out file] [--id x]`. Paths are relative to where npm was invoked
 * (INIT_CWD: npm runs workspace scripts inside the workspace folder), else the current folder.
 */
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';

export interface BuilderArgs {
  folder: string;
  out: string;
  /** file names to use (from --list: one per line, # comments), else every file of the folder */
  names?: string[];
  /** --id: the builder's id or id prefix */
  id?: string;
}

export const fromCwd = (p: string): string => resolve(process.env.INIT_CWD ?? process.cwd(), p);

export function parseBuilderArgs(
  argv: string[],
  defaults: { folder: string; out: string },
  idWord: string,
): BuilderArgs {
  const args: BuilderArgs = { ...defaults };
  const value = (i: number, option: string): string => {
    const v = argv[i];
    if (v === undefined || v.startsWith('--'))
      throw new Error(
        `${option} needs a value; use [folder] [--list file] [--out file] [--id ${idWord}].`,
      );
    return v;
  };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (a === '--out') args.out = fromCwd(value(++i, a));
    else if (a === '--list')
      args.names = readFileSync(fromCwd(value(++i, a)), 'utf8')
        .split('\n')
        .map((l) => l.trim())
        .filter((l) => l && !l.startsWith('#'));
    else if (a === '--id') args.id = value(++i, a);
    else if (a.startsWith('--'))
      throw new Error(
        `Unknown option ${a}; use [folder] [--list file] [--out file] [--id ${idWord}].`,
      );
    else args.folder = fromCwd(a);
  }
  return args;
}
