// Small helpers about operating-system processes, for tests that kill or watch them.
import { execFileSync } from 'node:child_process';
import { readdirSync, readFileSync } from 'node:fs';

/** True while a process with this id exists (signal 0 only checks). */
export function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

/** Ids of the direct children of a process (Linux: /proc; elsewhere: ps). */
export function childrenOf(pid: number): number[] {
  try {
    if (process.platform === 'linux') {
      return readdirSync(`/proc/${pid}/task`).flatMap((task) => readFileSync(`/proc/${pid}/task/${task}/children`, 'utf8').trim().split(/\s+/).filter(Boolean).map(Number));
    }
    return execFileSync('ps', ['-A', '-o', 'pid=,ppid='], { encoding: 'utf8' })
      .trim()
      .split('\n')
      .map((line) => line.trim().split(/\s+/).map(Number))
      .filter(([, parent]) => parent === pid)
      .map(([child]) => child);
  } catch {
    return [];
  }
}
