// Builds the programs of the product into dist/.
// The sandbox carries the engine as source text: it evaluates that text inside
// each fresh `vm` context, so user code and engine share one bare realm and no
// host object (with its route back to `process`) ever reaches user code.
import * as esbuild from 'esbuild';

const watch = process.argv.includes('--watch');
const common = {
  bundle: true,
  platform: 'node',
  target: 'node20',
  format: 'cjs',
  sourcemap: 'linked',
  logLevel: 'warning',
  // esbuild ships a native binary, so the server and CLI load it at run time.
  external: ['esbuild', 'vscode'],
};

async function inContextRunnerSource() {
  const result = await esbuild.build({
    entryPoints: ['server/src/sandbox/inContext.ts'],
    bundle: true,
    write: false,
    format: 'iife',
    globalName: '__slopecheckRunner',
    platform: 'neutral',
    target: 'es2022',
    logLevel: 'warning',
  });
  return result.outputFiles[0].text;
}

/** Makes `import runnerSource from 'slopecheck:in-context-runner'` a string of the engine bundle. */
const inContextRunnerPlugin = {
  name: 'in-context-runner',
  setup(build) {
    build.onResolve({ filter: /^slopecheck:in-context-runner$/ }, (args) => ({ path: args.path, namespace: 'in-context-runner' }));
    build.onLoad({ filter: /.*/, namespace: 'in-context-runner' }, async () => ({
      contents: `export default ${JSON.stringify(await inContextRunnerSource())};`,
      loader: 'js',
      watchFiles: [],
    }));
  },
};

const programs = [
  { entryPoints: ['client/src/extension.ts'], outfile: 'dist/extension.js' },
  // Minified: the server stays resident, and V8 keeps its whole source (TypeScript's
  // compiler is most of it) in memory; the linked source map keeps stack traces readable.
  { entryPoints: ['server/src/lsp/main.ts'], outfile: 'dist/server.js', minify: true },
  { entryPoints: ['server/src/cli/main.ts'], outfile: 'dist/cli.js', banner: { js: '#!/usr/bin/env node' } },
  { entryPoints: ['server/src/sandbox/worker.ts'], outfile: 'dist/sandbox.js', plugins: [inContextRunnerPlugin] },
  // The report webview's script runs in the editor's browser context.
  { entryPoints: ['client/src/report/webview.ts'], outfile: 'dist/report.js', platform: 'browser', format: 'iife', target: 'es2022' },
];

if (watch) {
  for (const program of programs) await (await esbuild.context({ ...common, ...program })).watch();
} else {
  await Promise.all(programs.map((program) => esbuild.build({ ...common, ...program })));
}
