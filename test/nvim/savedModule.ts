// Loads a saved TypeScript module (with its imports) into this process, to evaluate its functions
// independently of the server. Only for the project's own fixtures.
import * as esbuild from 'esbuild';
import * as vm from 'node:vm';

type VectorFunction<T> = (x: number[]) => T;

export async function gradientAt(file: string, objective: string, gradient: string) {
  const bundle = await esbuild.build({ entryPoints: [file], bundle: true, write: false, format: 'cjs', platform: 'neutral', logLevel: 'silent' });
  const module = { exports: {} as Record<string, unknown> };
  vm.runInNewContext(bundle.outputFiles[0].text, { module, exports: module.exports });
  return {
    objective: module.exports[objective] as VectorFunction<number>,
    gradient: module.exports[gradient] as VectorFunction<number[]>,
  };
}
