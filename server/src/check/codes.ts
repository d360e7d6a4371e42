// One description per finding code. The CLI's SARIF rules and the editor's diagnostic links (to
// the README shipped with the extension, whose finding reference has a section per code) come from here.
import type { FindingCode } from '../engine/types';

export const findingTitles: Record<FindingCode, string> = {
  'gradient-mismatch': 'The gradient disagrees with central differences of the objective beyond their error bound.',
  'jacobian-mismatch': 'The Jacobian disagrees with central differences of the residuals beyond their error bound.',
  'hessian-mismatch': 'The Hessian disagrees with central differences of the gradient beyond their error bound.',
  'hessian-vector-product-mismatch': 'The Hessian-vector product disagrees with directional differences of the gradient beyond their error bound.',
  'hessian-not-symmetric': 'The Hessian is not symmetric, so at least one of two mirrored entries is wrong.',
  'matrix-wrong-shape': 'The Jacobian or Hessian has the wrong shape, is transposed, or has ragged rows.',
  'matrix-undecided': 'Some entries (or directions) of a Jacobian or Hessian were neither confirmed nor found wrong at any probe, so the target does not pass.',
  'least-squares-inconsistent': 'The objective is ½‖r‖² (or ‖r‖²) of residuals with a Jacobian in the same file, and its gradient is not Jᵀr (or 2Jᵀr).',
  'value-not-a-vector': 'The residual function (or the gradient a Hessian is checked against) returns something that is not an array of numbers, or a different number of values from call to call.',
  'gradient-wrong-length': 'The gradient returns a vector whose length differs from the number of parameters.',
  'gradient-not-a-vector': 'The gradient returns something that is not an array of numbers.',
  'non-finite-value': 'The objective or the gradient returns NaN or Infinity at a probe.',
  'non-smooth-probe': 'One-sided differences disagree at a probe: the objective has a kink there, so no verdict is possible.',
  'noisy-objective': 'The objective is too noisy near a probe to decide whether the gradient is right.',
  'gradient-undecided': 'Some components (or directions) of the gradient were neither confirmed nor found wrong at any probe, so the pair does not pass.',
  'budget-spent': 'The check ran out of its time budget; the report holds what was decided before that.',
  'stationary-probe': 'The gradient is zero at a probe within the error bounds, so a wrong sign or factor cannot show there.',
  'objective-not-a-number': 'The objective returns something other than a number.',
  'unrepeatable-objective': 'Two calls of the objective at the same point gave different values.',
  'input-mutated': 'The objective or the gradient changes the point it was given.',
  'async-result': 'The function returns a Promise; only synchronous objectives and gradients can be checked.',
  'runtime-error': 'The user code threw while being checked.',
  timeout: 'The check did not finish within the time limit; the sandbox was stopped.',
  'sandbox-crash': 'The sandbox process ended unexpectedly while running the user code.',
  'memory-limit': 'The user code used more memory than the sandbox allows.',
  'builtin-import': 'The module imports a Node built-in module, so it is not executed.',
  'bundle-error': 'The module or one of its imports could not be bundled.',
  'syntax-error': 'The file has a syntax error.',
  'missing-export': 'A tag names a function or value the file does not have.',
  'unresolved-target': 'A value the check needs (an instance, a class, a factory result, data or the start point) could not be obtained or has the wrong shape.',
  'missing-argument': 'The objective takes arguments after the point, and no value for them was found.',
  'ambiguous-pair': 'More than one function could complete a pair; none was checked until a tag settles it.',
  'unpaired-function': 'A function that looks like a gradient was not paired with an objective.',
  'unknown-dimension': 'The number of parameters cannot be told; a probe point is needed.',
  'bad-probe': 'A probe point is malformed or does not match the other probes.',
  'rate-aggressive': 'The declared learning rate is above the local safe step 1/L̂ but below the divergence threshold 2/λ⁺.',
  'rate-divergent': 'The declared learning rate is at or above the local divergence threshold 2/λ⁺.',
  'rate-unconfirmed': 'A short run of gradient steps at the declared rate did not behave as the smoothness estimate predicts.',
};

/** Link to a code's section in the README at `readme` (the heading is the code itself). */
export function findingHelpUrl(code: FindingCode, readme: string): string {
  return `${readme}#${code}`;
}

export const allFindingCodes = Object.keys(findingTitles) as FindingCode[];
