// How each kind of target is named, one entry per kind: the engine's findings, the CLI, the
// editor and the report all word a target's two functions, its entries and its codes from here.
import type { FindingCode, TargetKind } from './types';

export interface KindWording {
  /** What the value function is: 'objective', 'residual function', 'gradient'. */
  value: string;
  /** What the derivative function is: 'gradient', 'Jacobian', 'Hessian'. */
  derivative: string;
  /** One output of the value function, for matrix rows: 'residual', 'gradient component'. */
  output: string;
  /** The finding code of a derivative that disagrees with its differences. */
  mismatchCode: FindingCode;
  /** An entry's label: `J[3][1]`, `H[0][2]`; for a gradient, a component's. */
  entry(row: number, column: number): string;
}

export const kindWording: Readonly<Record<TargetKind, KindWording>> = {
  gradient: { value: 'objective', derivative: 'gradient', output: 'value', mismatchCode: 'gradient-mismatch', entry: (_row, column) => `∂f/∂x[${column}]` },
  jacobian: { value: 'residual function', derivative: 'Jacobian', output: 'residual', mismatchCode: 'jacobian-mismatch', entry: (row, column) => `J[${row}][${column}]` },
  hessian: { value: 'gradient', derivative: 'Hessian', output: 'gradient component', mismatchCode: 'hessian-mismatch', entry: (row, column) => `H[${row}][${column}]` },
  hessianVectorProduct: { value: 'gradient', derivative: 'Hessian-vector product', output: 'gradient component', mismatchCode: 'hessian-vector-product-mismatch', entry: (row, column) => `H[${row}][${column}]` },
};
