// How a sandbox process is started: Node's permission model with the flags this runtime
// knows (detected, never guessed from the version), and, where the platform allows it
// without privileges, no network at all (a fresh user and network namespace on Linux).
import { spawnSync } from 'node:child_process';

export type NetworkConfinement = 'namespace' | 'permission' | 'none';

export interface SandboxLaunch {
  command: string;
  args: string[];
  /** How the network is kept from user code: an empty network namespace, Node's permission model, or not at all. */
  network: NetworkConfinement;
}

const has = (flag: string) => process.allowedNodeEnvironmentFlags.has(flag);

/** Node flags of a sandbox process running `script` with a heap of `memoryMb`. */
export function sandboxFlags(script: string, memoryMb: number, semiSpaceMb: number): string[] {
  return [
    has('--permission') ? '--permission' : '--experimental-permission',
    `--allow-fs-read=${script}`,
    '--no-warnings',
    `--max-old-space-size=${memoryMb}`,
    // vm.Script still compiles our code; this only stops eval and new Function in the host realm.
    '--disallow-code-generation-from-strings',
    `--max-semi-space-size=${semiSpaceMb}`,
    // Lets the sandbox answer a dynamic import() with an error of the user's own realm.
    ...(has('--experimental-vm-modules') ? ['--experimental-vm-modules'] : []),
  ];
}

/** `unshare` options for a new user namespace (no privileges needed) with an empty network namespace. */
const namespaceOptions = ['--user', '--map-root-user', '--net'];
let namespaceWorks: boolean | null = null;

/** True when this machine lets an unprivileged process enter a new user and network namespace (probed once). */
export function networkNamespaceAvailable(): boolean {
  if (namespaceWorks === null) {
    namespaceWorks =
      process.platform === 'linux' &&
      spawnSync('unshare', [...namespaceOptions, process.execPath, '-e', '0'], { stdio: 'ignore', timeout: 5000, env: {} }).status === 0;
  }
  return namespaceWorks;
}

export function sandboxLaunch(script: string, memoryMb: number, semiSpaceMb: number): SandboxLaunch {
  const node = [...sandboxFlags(script, memoryMb, semiSpaceMb), script];
  if (networkNamespaceAvailable()) return { command: 'unshare', args: [...namespaceOptions, process.execPath, ...node], network: 'namespace' };
  // From the Node release whose permission model covers the network, no --allow-net means none.
  return { command: process.execPath, args: node, network: has('--allow-net') ? 'permission' : 'none' };
}
