// The resident set of another process, read the cheap way the platform offers: on Linux,
// VmRSS in /proc/<pid>/status. Elsewhere there is no reading (null), and only the heap cap holds.
import { readFileSync } from 'node:fs';

export function residentBytes(pid: number): number | null {
  if (process.platform !== 'linux') return null;
  try {
    const match = /^VmRSS:\s+(\d+)\s+kB/m.exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
    return match ? Number(match[1]) * 1024 : null;
  } catch {
    // The process has just ended.
    return null;
  }
}
