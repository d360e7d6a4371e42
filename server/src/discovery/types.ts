// What discovery finds in one document. Positions come from the text as given
// (an unsaved buffer works), so the editor can place diagnostics and edits.
import type { CheckPlan, Finding, TargetKind } from '../engine/types';
import type { ImporterEntry } from './importerCalls';

/** How a target was found, for explanations in hovers and docs: 'tag' is a kind's tag (@gradientOf, @jacobianOf, …). */
export type MatchedBy = 'name' | 'shared-stem' | 'only-candidate' | 'tag' | 'combined';

/** A range in the document: offsets for edits, 0-based line/character for LSP, 1-based line for the CLI. */
export interface SourceSpan {
  start: number;
  end: number;
  startLine: number;
  startCharacter: number;
  endLine: number;
  endCharacter: number;
  /** 1-based line of `start`. */
  line: number;
}

export interface NamedSpan {
  name: string;
  /** The identifier itself. */
  nameSpan: SourceSpan;
  /** The whole declaration (statement), e.g. for inserting a JSDoc tag above it. */
  declarationSpan: SourceSpan;
}

/** One check target: a value function and its derivative, and how to call them. */
export interface DiscoveredPair {
  kind: TargetKind;
  /**
   * Names the target within its document, for the editor's requests and caches: the objective's
   * name for a gradient pair, the derivative's (the Jacobian's, the Hessian's) for the other
   * kinds, whose value function may serve several targets.
   */
  key: string;
  /** A Hessian or Hessian-vector product: the key of the gradient pair whose gradient it is checked against. */
  gradientPair?: string;
  objective: NamedSpan & {
    /** Each `@probe` tag's span, for related information and edits. */
    probeTags: SourceSpan[];
  };
  /** Null for a combined pair (one function returning value and gradient). */
  gradient: (NamedSpan & {
    /** Expressions of the gradient's `return` statements, for quick-fix edits. */
    returnExpressions: SourceSpan[];
  }) | null;
  learningRate: (NamedSpan & { value: number; valueSpan: SourceSpan; momentum?: { name: string; value: number } }) | null;
  matchedBy: MatchedBy;
  /** Where each scope key of the plan is named (host, data, start), for findings about a value that fails at run time. */
  recipeSpans: Record<string, SourceSpan>;
  /**
   * Null when the document itself is the bundle's entry. Set when the data come from a file that
   * imports it: that file is bundled instead, with the document's text in place of its file.
   */
  entry: ImporterEntry | null;
  /** A `// slopecheck-skip` comment sits directly above the objective: the pair is not checked. */
  skipped: boolean;
  /** Plan without options: the caller merges its settings in. */
  plan: Omit<CheckPlan, 'options'>;
  /**
   * Problems found before running anything (unknown dimension, unreadable @probe).
   * When one has severity 'error' or code 'unknown-dimension', the pair is not run.
   */
  findings: Finding[];
}

export interface DiscoveryResult {
  pairs: DiscoveredPair[];
  /** 1-based line → syntax errors and other whole-file problems. */
  fileFindings: Array<Finding & { span: SourceSpan }>;
}
