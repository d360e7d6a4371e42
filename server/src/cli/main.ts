// `slopecheck`: checks the objective/gradient pairs of files and folders from a terminal or CI.
import * as os from 'node:os';
import * as path from 'node:path';
import { checkDocument } from '../check/checkDocument';
import { ImporterIndex, type SourceText } from '../discovery/importers';
import { printableLine } from '../shared/plainText';
import { defaultCheckOptions } from '../engine/types';
import { SandboxPool } from '../sandbox/pool';
import { productVersion, sandboxScriptPath } from '../shared/productInfo';
import { CliArguments, parseArguments, usage, UsageError } from './args';
import { collectFiles, describeFsError, readSource } from './files';
import { formatJson } from './formatJson';
import { formatSarif } from './formatSarif';
import { formatText } from './formatText';
import { exitCode, FileOutcome, summarise } from './outcome';

async function main(argv: string[]): Promise<number> {
  let args: CliArguments | 'help';
  try {
    args = parseArguments(argv);
  } catch (error) {
    if (!(error instanceof UsageError)) throw error;
    process.stderr.write(`slopecheck: ${error.message}\n\n${usage}\n`);
    return 2;
  }
  if (args === 'help') {
    process.stdout.write(usage + '\n');
    return 0;
  }

  const { files, unreadable } = await collectFiles(args.paths);
  for (const u of unreadable) process.stderr.write(`slopecheck: cannot read ${printableLine(u.path)}: ${printableLine(u.message)}\n`);

  const outcomes = await checkFiles(files, args);
  outcomes.push(...unreadable.map((u) => ({ path: u.path, check: null, error: u.message })));
  outcomes.sort((a, b) => a.path.localeCompare(b.path));

  const cwd = process.cwd();
  const meta = { version: productVersion, seed: args.seed, cwd };
  const document =
    args.format === 'json' ? formatJson(outcomes, meta) + '\n' : args.format === 'sarif' ? formatSarif(outcomes, meta) + '\n' : formatText(outcomes);
  await new Promise<void>((resolve) => process.stdout.write(document, () => resolve()));
  return exitCode(summarise(outcomes));
}

/** Checks files in parallel, one sandbox process per worker; a broken file never stops the others. */
async function checkFiles(files: string[], args: CliArguments): Promise<FileOutcome[]> {
  // Every file of the run is read once: to check it, and to find the files that import another
  // (a training script whose data a pair in another file needs).
  const texts = new Map<string, string | Error>();
  await Promise.all(files.map(async (file) => texts.set(file, await readSource(file).catch((error: Error) => error))));
  const sources: SourceText[] = [...texts].flatMap(([file, text]) => (typeof text === 'string' ? [{ fileName: path.resolve(file), text }] : []));
  const importers = new ImporterIndex(sources);
  const workers = Math.max(1, Math.min(files.length, os.availableParallelism?.() ?? os.cpus().length, 4));
  const pool = new SandboxPool({ sandboxScript: sandboxScriptPath(), timeoutMs: args.timeoutMs, memoryMb: args.memoryMb, size: workers });
  const options = { ...defaultCheckOptions, seed: args.seed, smoothness: args.smoothness };
  const outcomes: FileOutcome[] = [];
  const progress = process.stderr.isTTY ? (text: string) => process.stderr.write(`\r\x1b[K${text}`) : () => {};
  let next = 0;
  const worker = async () => {
    while (next < files.length) {
      const file = files[next++];
      const shown = path.relative(process.cwd(), file) || file;
      progress(`checking ${outcomes.length + 1}/${files.length} ${printableLine(shown)}`);
      try {
        const text = texts.get(file);
        if (typeof text !== 'string') throw text;
        // The working folder is the workspace: a file outside it is bundled under its own folder.
        const check = await checkDocument(text, path.resolve(file), pool, options, undefined, {
          importersOf: async (fileName) => importers.importersOf(fileName),
          workspaceRoot: process.cwd(),
        });
        outcomes.push({ path: shown, check, error: null });
      } catch (error) {
        process.stderr.write(`slopecheck: cannot check ${printableLine(shown)}: ${printableLine(describeFsError(error))}\n`);
        outcomes.push({ path: shown, check: null, error: describeFsError(error) });
      }
    }
  };
  try {
    await Promise.all(Array.from({ length: workers }, worker));
  } finally {
    progress('');
    pool.dispose();
  }
  return outcomes;
}

main(process.argv.slice(2)).then(
  (code) => process.exit(code),
  (error) => {
    process.stderr.write(`slopecheck: internal error: ${error instanceof Error ? error.stack : String(error)}\n`);
    process.exit(2);
  },
);
