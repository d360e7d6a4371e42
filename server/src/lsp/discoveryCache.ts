// Discovery of the latest version of each open document, for hover, lenses and fixes:
// recomputed only when the text changes, and forgotten when the document closes.
import type { DiscoveredPair } from '../discovery/types';

export class DiscoveryCache {
  private readonly entries = new Map<string, { version: number; pairs: DiscoveredPair[] }>();

  pairs(uri: string, version: number, discover: () => DiscoveredPair[]): DiscoveredPair[] {
    const hit = this.entries.get(uri);
    if (hit && hit.version === version) return hit.pairs;
    const pairs = discover();
    this.entries.set(uri, { version, pairs });
    return pairs;
  }

  forget(uri: string): void {
    this.entries.delete(uri);
  }

  /** Test hook: documents remembered. */
  get size(): number {
    return this.entries.size;
  }
}
