// The global `process` user code sees inside the sandbox: inert, built in the sandbox's
// realm, so a script guard (`process.argv[1]`, `require.main === module`) evaluates to
// "not the entry point" and the module loads. Runs inside the vm context; no Node APIs.

export function installProcessStandIn(): void {
  const refuse = (name: string) => () => {
    throw new Error(`${name} is not available in the sandbox.`);
  };
  const inert: Record<string, unknown> = {
    argv: [],
    env: {},
    execArgv: [],
    platform: 'sandbox',
    version: '',
    versions: {},
    exit: refuse('process.exit'),
    cwd: () => '/',
    stdout: { write: () => true, isTTY: false },
    stderr: { write: () => true, isTTY: false },
  };
  for (const method of ['on', 'once', 'off']) inert[method] = () => inert;
  Object.defineProperty(globalThis, 'process', { value: inert, writable: true, configurable: true });
}
