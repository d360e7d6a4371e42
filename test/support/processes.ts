// Small helpers about operating-system processes, for tests that kill or watch them.

/** True while a process with this id exists (signal 0 only checks). */
export function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}
