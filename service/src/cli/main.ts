#!/usr/bin/env node
/**
 * The `foldfolio` command. Subcommands dispatch to their own modules; the engine's commands
 * live in @foldfolio/shared/src/cli (Node edge of the engine).
 * Add a subcommand: one entry in COMMANDS (name → runner returning the exit code).
 */
import { runReportCommand, REPORT_USAGE } from '@foldfolio/shared/dist/cli/report.js';
import { FIGURES_USAGE, runFiguresCommand } from '../figures/cli.js';
import { runTablesCommand, TABLES_USAGE } from '../tables/cli.js';
import {
  PACKAGE_USAGE,
  runPackageCommand,
  runVerifyCommand,
  VERIFY_USAGE,
} from '../packages/cli.js';

type Runner = (
  args: string[],
  io: { out: (t: string) => void; err: (t: string) => void },
) => Promise<number>;

const COMMANDS: Record<string, { run: Runner; usage: string }> = {
  report: { run: runReportCommand, usage: REPORT_USAGE },
  figures: { run: runFiguresCommand, usage: FIGURES_USAGE },
  tables: { run: runTablesCommand, usage: TABLES_USAGE },
  package: { run: runPackageCommand, usage: PACKAGE_USAGE },
  verify: { run: runVerifyCommand, usage: VERIFY_USAGE },
};

function usage(): string {
  return (
    [
      'usage: foldfolio <command> [options]',
      ...Object.values(COMMANDS).map((c) => '  ' + c.usage),
    ].join('\n') + '\n'
  );
}

async function main(argv: string[]): Promise<number> {
  const [name, ...rest] = argv;
  const io = {
    out: (t: string) => void process.stdout.write(t),
    err: (t: string) => void process.stderr.write(t),
  };
  if (name === undefined || name === '--help' || name === '-h') {
    io.out(usage());
    return name === undefined ? 2 : 0;
  }
  const cmd = COMMANDS[name];
  if (cmd === undefined) {
    io.err(
      `foldfolio: unknown command "${name}"; the commands are: ${Object.keys(COMMANDS).join(', ')}.\n`,
    );
    return 2;
  }
  return cmd.run(rest, io);
}

main(process.argv.slice(2)).then(
  (code) => {
    process.exitCode = code;
  },
  (e: unknown) => {
    process.stderr.write(
      `foldfolio: unexpected failure: ${e instanceof Error ? e.message : String(e)}\n`,
    );
    process.exitCode = 1;
  },
);
