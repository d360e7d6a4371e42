// The in-context runner (inContext.ts bundled as an IIFE with the engine), inlined by esbuild.mjs.
declare module 'slopecheck:in-context-runner' {
  const runnerSource: string;
  export default runnerSource;
}
