// Public API of the sandbox for the CLI and the language server.
export { bundleDocument, isRunnable, unrunnableBundleFindings, type Bundle, type BundleError } from './bundle';
export { SandboxPool, type SandboxPoolOptions, type SandboxResult } from './pool';
export { locateInUserSource, type SourceLocation } from './sourceMap';
