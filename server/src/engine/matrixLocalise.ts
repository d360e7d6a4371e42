// Finding the wrong columns of a large matrix after random directions disagreed: adaptive group
// testing, one directional difference of F per pool, as for a gradient's components (localise.ts).
import { directCheckSize, splitPool } from './localise';
import { checkColumns, checkProduct, randomDirection } from './matrixComparisons';
import type { MatrixProbeOutcome } from './matrixProbe';
import type { Random } from './random';
import { BudgetSpent } from './userCalls';

// Directional differences (pooled and column) allowed for locating wrong columns at one probe.
const localisationBudget = 80;

/**
 * Adaptive group testing over columns: a pool's direction (zero outside it) disagrees when a
 * wrong entry lies in one of its columns; disagreeing pools are split, and pools of a few columns
 * are checked column by column, which gives the wrong entries themselves.
 */
export function locateColumns(outcome: MatrixProbeOutcome, random: Random): void {
  const search = { pooled: 0, columns: 0, incomplete: false };
  const spend = () => {
    if (search.pooled + search.columns >= localisationBudget) {
      search.incomplete = true;
      return false;
    }
    return true;
  };
  const visit = (pool: number[]) => {
    if (pool.length <= directCheckSize) {
      for (const j of pool) {
        if (!spend()) return;
        search.columns++;
        checkColumns(outcome, [j]);
      }
      return;
    }
    for (const members of splitPool(pool, random)) {
      if (!spend()) return;
      search.pooled++;
      if (checkProduct(outcome.context, randomDirection(outcome.context, random, members)).wrongRows.length > 0) visit(members);
    }
  };
  try {
    visit([...outcome.context.x.keys()]);
  } catch (err) {
    if (!(err instanceof BudgetSpent)) throw err;
    search.incomplete = true;
  } finally {
    outcome.localisation = { pooledDifferences: search.pooled, coordinateDifferences: search.columns, incomplete: search.incomplete };
  }
}

