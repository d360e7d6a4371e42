// Inert stand-ins for what a script guard touches (`if (process.argv[1] === fileURLToPath(import.meta.url)) main()`),
// so such a module still loads in the sandbox. They are built inside the sandbox's realm and hold
// nothing of the host: no real arguments, environment, exit or file system.

/** Module sources for the built-ins a script guard imports, by name without `node:`. */
export const scriptGuardStandIns: Readonly<Record<string, string>> = {
  url: `
    const toPath = (url) => { const text = String(url && url.href !== undefined ? url.href : url); return text.startsWith('file://') ? decodeURIComponent(text.slice(7)) : text; };
    module.exports = {
      fileURLToPath: toPath,
      pathToFileURL: (path) => { const href = 'file://' + String(path); return { href, pathname: String(path), toString: () => href }; },
    };`,
  // The same inert object as the global `process` (processStandIn.ts).
  process: 'module.exports = globalThis.process;',
};
