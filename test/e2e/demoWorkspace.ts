// A throwaway copy of fixtures/demo for the editor to open and change, and the
// truth the demo was built with (fixtures/demo/expected.json).
import { cpSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { fixturesDir } from '../support/paths';

const demoDir = path.join(fixturesDir, 'demo');

interface ExpectedPair {
  file: string;
  objective: string;
  status: string;
  learningRate?: { name: string; status: string; value: number; lipschitz: number };
}

export class DemoWorkspace {
  private constructor(readonly folder: string) {}

  static copy(): DemoWorkspace {
    const folder = mkdtempSync(path.join(os.tmpdir(), 'slopecheck-demo-'));
    cpSync(demoDir, folder, { recursive: true });
    return new DemoWorkspace(folder);
  }

  read(relativePath: string): string {
    return readFileSync(path.join(this.folder, relativePath), 'utf8');
  }

  /** 1-based line and column of the first declaration of `name` (`function name`, `const name`), as the editor counts them. */
  declarationOf(relativePath: string, name: string): { line: number; column: number } {
    const lines = this.read(relativePath).split('\n');
    const declaration = new RegExp(`\\b(function|const)\\s+${name}\\b`);
    const index = lines.findIndex((line) => declaration.test(line));
    if (index < 0) throw new Error(`${name} is not declared in ${relativePath}`);
    return { line: index + 1, column: lines[index].search(new RegExp(`\\b${name}\\b`)) + 1 };
  }

  remove(): void {
    rmSync(this.folder, { recursive: true, force: true });
  }
}

/** The demo's truth for one pair: Lipschitz constants computed outside the product (see expected.json's $comment). */
export function expectedPair(objective: string): ExpectedPair {
  const { pairs } = JSON.parse(readFileSync(path.join(demoDir, 'expected.json'), 'utf8')) as { pairs: ExpectedPair[] };
  const pair = pairs.find((p) => p.objective === objective);
  if (!pair) throw new Error(`fixtures/demo/expected.json has no pair ${objective}`);
  return pair;
}
