// Declared learning rates: an exported numeric const tagged `@learningRateFor X`, or, when the
// file has exactly one pair, an exported numeric const with a conventional name (`lr`, `eta`, …).
import type * as ts from 'typescript';
import { evaluateNumber } from './constant';
import { learningRateNames, tagNames } from './conventions';
import type { ModuleBindings, TopLevelBinding } from './exports';
import type { PairMatch } from './pairing';
import { spanOfNode } from './spans';
import { firstWord, readTags } from './tags';
import type { DiscoveredPair, DiscoveryResult } from './types';

export type DeclaredRate = NonNullable<DiscoveredPair['learningRate']>;

export function assignLearningRates(
  sourceFile: ts.SourceFile,
  bindings: ModuleBindings,
  matches: PairMatch[],
): { rates: Map<PairMatch, DeclaredRate>; fileFindings: DiscoveryResult['fileFindings'] } {
  const rates = new Map<PairMatch, DeclaredRate>();
  const fileFindings: DiscoveryResult['fileFindings'] = [];
  const untagged: DeclaredRate[] = [];

  for (const { exportName, binding } of bindings.exported) {
    if (!binding.constValue) continue;
    const tag = readTags(sourceFile, binding.docHost, tagNames.learningRateFor)[0];
    const rate = declaredRate(sourceFile, exportName, binding);
    if (!tag) {
      if (rate && learningRateNames.includes(exportName)) untagged.push(rate);
      continue;
    }
    const target = firstWord(tag.text);
    const match = matches.find((m) => m.objective.name === target || m.gradient?.name === target);
    if (!match) {
      fileFindings.push({
        code: 'missing-export',
        severity: 'error',
        subject: 'learningRate',
        message: `\`${exportName}\` is tagged @learningRateFor ${target || '(nothing)'}, but this file has no checked objective named \`${target}\`.`,
        span: tag.span,
      });
    } else if (rate && !rates.has(match)) {
      rates.set(match, rate);
    }
  }

  // A conventional name is only unambiguous when there is a single pair it could belong to.
  if (matches.length === 1 && !rates.has(matches[0]) && untagged.length > 0) rates.set(matches[0], untagged[0]);
  return { rates, fileFindings };
}

/** A positive finite value computed from literals, or null (not a learning rate we can read). */
function declaredRate(sourceFile: ts.SourceFile, name: string, binding: TopLevelBinding): DeclaredRate | null {
  const expression = binding.constValue!;
  const value = evaluateNumber(expression);
  if (value === null || !Number.isFinite(value) || value <= 0) return null;
  return {
    name,
    nameSpan: spanOfNode(sourceFile, binding.nameNode),
    declarationSpan: spanOfNode(sourceFile, binding.statement),
    value,
    valueSpan: spanOfNode(sourceFile, expression),
  };
}
