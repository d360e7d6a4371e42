// Command-line arguments of `slopecheck`.
import { defaultSettings, memoryFloorMb } from '../shared/settings';
export type OutputFormat = 'text' | 'json' | 'sarif';

export interface CliArguments {
  format: OutputFormat;
  seed: number;
  timeoutMs: number;
  /** Estimate L̂ and the safe step for every passing pair, not only those with a declared learning rate. */
  smoothness: boolean;
  /** Memory of one sandbox process, in MB (the editor's memoryMb setting). */
  memoryMb: number;
  /** Files and folders to check, as given. */
  paths: string[];
}

export const usage = `Usage: slopecheck [--format text|json|sarif] [--seed N] [--timeout-ms N] [--memory-mb N] [--smoothness] <files or folders...>

Checks the objective/gradient pairs, residual/Jacobian pairs, Hessians and
Hessian-vector products of the given .ts, .tsx, .js and .jsx files (module-level functions,
exported or not, and methods of module-level objects; folders are searched
recursively, node_modules skipped). Checking a file runs its code in a sandbox
process.

  --format      text (default), json or sarif; json and sarif go to stdout alone
  --seed        seed of the random probes and directions (default 1)
  --timeout-ms  time budget for checking one pair, in milliseconds (default ${defaultSettings.timeoutMs})
  --memory-mb   memory of one sandbox process, in MB (default ${defaultSettings.memoryMb}, at least ${memoryFloorMb})
  --smoothness  estimate L̂ and the safe step 1/L̂ for every passing target; without it,
                only targets with a declared learning rate get them
  --help        show this text

Exit status: 0 no error-level finding, 1 at least one, 2 usage error or unreadable input.`;

export class UsageError extends Error {}

/** Parses argv (without node and script); throws UsageError with a message fit for the user. */
export function parseArguments(argv: string[]): CliArguments | 'help' {
  const result: CliArguments = { format: 'text', seed: 1, timeoutMs: defaultSettings.timeoutMs, smoothness: false, memoryMb: defaultSettings.memoryMb, paths: [] };
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    const [flag, inlineValue] = arg.startsWith('--') && arg.includes('=') ? [arg.slice(0, arg.indexOf('=')), arg.slice(arg.indexOf('=') + 1)] : [arg, undefined];
    const value = (): string => {
      const v = inlineValue ?? argv[++i];
      if (v === undefined) throw new UsageError(`${flag} needs a value`);
      return v;
    };
    switch (flag) {
      case '--help':
      case '-h':
        return 'help';
      case '--format': {
        const v = value();
        if (v !== 'text' && v !== 'json' && v !== 'sarif') throw new UsageError(`--format must be text, json or sarif, not '${v}'`);
        result.format = v;
        break;
      }
      case '--seed':
        result.seed = integer(flag, value(), 0);
        break;
      case '--timeout-ms':
        result.timeoutMs = integer(flag, value(), 1);
        break;
      case '--memory-mb':
        result.memoryMb = integer(flag, value(), memoryFloorMb);
        break;
      case '--smoothness':
        if (inlineValue !== undefined) throw new UsageError('--smoothness takes no value');
        result.smoothness = true;
        break;
      default:
        if (flag.startsWith('-') && flag !== '-') throw new UsageError(`unknown option ${flag}`);
        result.paths.push(arg);
    }
  }
  if (result.paths.length === 0) throw new UsageError('no files or folders given');
  return result;
}

function integer(flag: string, text: string, min: number): number {
  const n = Number(text);
  if (!/^\d+$/.test(text) || !Number.isSafeInteger(n) || n < min) throw new UsageError(`${flag} must be a whole number ≥ ${min}, not '${text}'`);
  return n;
}
