// Runs the built CLI as a user would and collects what it printed.
import { spawn } from 'node:child_process';
import { cliScript, repoRoot } from './paths';

export interface CliRun {
  code: number | null;
  stdout: string;
  stderr: string;
}

export function runCli(args: string[], options: { cwd?: string; timeoutMs?: number } = {}): Promise<CliRun> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [cliScript, ...args], { cwd: options.cwd ?? repoRoot, stdio: ['ignore', 'pipe', 'pipe'] });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (chunk) => (stdout += chunk));
    child.stderr.on('data', (chunk) => (stderr += chunk));
    const timer = setTimeout(() => {
      child.kill('SIGKILL');
      reject(new Error(`slopecheck ${args.join(' ')} did not finish within ${options.timeoutMs ?? 120000} ms\nstderr: ${stderr}`));
    }, options.timeoutMs ?? 120000);
    child.on('error', reject);
    child.on('close', (code) => {
      clearTimeout(timer);
      resolve({ code, stdout, stderr });
    });
  });
}
