// How a sandbox process is started: Node's permission model with the flags this runtime
// knows (detected, never guessed from the version), and, where the platform allows it
// without privileges, no network at all (a fresh user and network namespace on Linux, a
// deny-network sandbox profile on macOS). Each OS confinement is tried once before it is used.
import { spawnSync } from 'node:child_process';

export type NetworkConfinement = 'namespace' | 'profile' | 'permission' | 'none';

export interface SandboxLaunch {
  command: string;
  args: string[];
  /** How the network is kept from user code: an empty network namespace, a sandbox profile, Node's permission model, or not at all. */
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

/** An OS-level wrapper that keeps a command off the network: `command ...options program ...`. */
interface NetworkWrapper {
  network: NetworkConfinement;
  command: string;
  options: string[];
}

/** Linux: `unshare` into a new user namespace (no privileges needed) with an empty network namespace. */
const namespaceWrapper: NetworkWrapper = { network: 'namespace', command: 'unshare', options: ['--user', '--map-root-user', '--net'] };

/**
 * macOS: `sandbox-exec` with a profile that denies IP networking in and out. The IPC channel to the
 * host is a socket pair made before the program starts, which the profile leaves alone.
 */
const macProfile = '(version 1) (allow default) (deny network-outbound (remote ip)) (deny network-inbound (local ip)) (deny network-bind (local ip))';
const profileWrapper: NetworkWrapper = { network: 'profile', command: '/usr/bin/sandbox-exec', options: ['-p', macProfile] };

/** The wrapper this platform offers, before it has been tried. */
export function networkWrapperFor(platform: NodeJS.Platform): NetworkWrapper | null {
  if (platform === 'linux') return namespaceWrapper;
  if (platform === 'darwin') return profileWrapper;
  return null;
}

const wrapperWorks = new Map<NetworkWrapper, boolean>();

/** The platform's wrapper when it runs Node on this machine (tried once: a kernel or policy may forbid it). */
export function workingNetworkWrapper(): NetworkWrapper | null {
  const wrapper = networkWrapperFor(process.platform);
  if (wrapper === null) return null;
  if (!wrapperWorks.has(wrapper)) {
    wrapperWorks.set(wrapper, spawnSync(wrapper.command, [...wrapper.options, process.execPath, '-e', '0'], { stdio: 'ignore', timeout: 5000, env: {} }).status === 0);
  }
  return wrapperWorks.get(wrapper) ? wrapper : null;
}

export function sandboxLaunch(script: string, memoryMb: number, semiSpaceMb: number): SandboxLaunch {
  const node = [...sandboxFlags(script, memoryMb, semiSpaceMb), script];
  const wrapper = workingNetworkWrapper();
  if (wrapper !== null) return { command: wrapper.command, args: [...wrapper.options, process.execPath, ...node], network: wrapper.network };
  // From the Node release whose permission model covers the network, no --allow-net means none.
  return { command: process.execPath, args: node, network: has('--allow-net') ? 'permission' : 'none' };
}
