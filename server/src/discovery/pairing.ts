// Which exported functions form objective/gradient pairs: `@gradientOf` tags first, then
// gradient names (`lossGrad`, `gradLoss`, …), then combined value-and-gradient functions.
import type * as ts from 'typescript';
import type { Finding } from '../engine/types';
import { combinedGradientKeys, combinedValueKey, gradientNamesFor, isCombinedName, tagNames } from './conventions';
import type { ModuleBindings, TopLevelBinding } from './exports';
import { returnedObjectKeys } from './returns';
import { spanOfNode } from './spans';
import { firstWord, hasTag, readTags } from './tags';
import { objectTypeKeys, returnType, type TypeDeclarations } from './typeShapes';
import type { DiscoveryResult } from './types';

export interface MatchedFunction {
  /** The name the module exports it under (or its local name when it is not exported). */
  name: string;
  binding: TopLevelBinding;
}

export interface PairMatch {
  objective: MatchedFunction;
  gradient: MatchedFunction | null;
  combined: { valueKey: string; gradientKey: string } | null;
  matchedBy: 'name' | 'gradientOf-tag' | 'combined';
  findings: Finding[];
}

type FileFinding = DiscoveryResult['fileFindings'][number];

export function matchPairs(
  sourceFile: ts.SourceFile,
  bindings: ModuleBindings,
  types: TypeDeclarations,
): { matches: PairMatch[]; fileFindings: FileFinding[] } {
  const exportedFunctions = bindings.exported.filter(({ binding }) => binding.fn !== null);
  const exportNameOf = (binding: TopLevelBinding) => exportedFunctions.find((entry) => entry.binding === binding)?.exportName;
  const combinedKeys = new Map<TopLevelBinding, string>();
  for (const { exportName, binding } of exportedFunctions) {
    const key = combinedGradientKey(exportName, binding, types);
    if (key) combinedKeys.set(binding, key);
  }

  const matches: PairMatch[] = [];
  const fileFindings: FileFinding[] = [];
  const usedAsGradient = new Set<TopLevelBinding>();
  const objectivesByTag = new Set<TopLevelBinding>();

  for (const gradient of bindings.functions) {
    const tag = readTags(sourceFile, gradient.docHost, tagNames.gradientOf)[0];
    if (!tag) continue;
    usedAsGradient.add(gradient);
    const gradientName = exportNameOf(gradient);
    const target = firstWord(tag.text);
    const missing = (message: string, span = tag.span) =>
      fileFindings.push({ code: 'missing-export', severity: 'error', subject: 'gradient', message, span });
    if (gradientName === undefined) {
      missing(`\`${gradient.localName}\` is tagged @gradientOf but is not exported, so it cannot be checked. Add \`export\` to it.`, spanOfNode(sourceFile, gradient.nameNode));
      continue;
    }
    if (target === '') {
      missing(`\`@gradientOf\` on \`${gradientName}\` needs the objective's name, e.g. /** @gradientOf loss */.`);
      continue;
    }
    // The tag may name the objective by its export name or, for `export { a as loss }`, its local name.
    const objective = [bindings.byExportName.get(target), bindings.byLocalName.get(target)].find((b) => b?.fn && b !== gradient);
    if (!objective) {
      missing(`\`${gradientName}\` is tagged @gradientOf ${target}, but this file has no function named \`${target}\`.`);
      continue;
    }
    if (objectivesByTag.has(objective)) continue;
    objectivesByTag.add(objective);
    const objectiveName = bindings.byExportName.get(target) === objective ? target : exportNameOf(objective);
    if (objectiveName !== undefined) {
      matches.push(pairOf({ name: objectiveName, binding: objective }, { name: gradientName, binding: gradient }, 'gradientOf-tag', []));
    } else {
      // Still a pair, so the editor can show where the objective is, but it is not run.
      const finding: Finding = {
        code: 'missing-export',
        severity: 'error',
        subject: 'gradient',
        message: `\`${gradientName}\` is the gradient of \`${target}\`, but \`${target}\` is not exported, so the checker cannot call it. Add \`export\` to \`${target}\`.`,
      };
      matches.push(pairOf({ name: target, binding: objective }, { name: gradientName, binding: gradient }, 'gradientOf-tag', [finding]));
    }
  }

  for (const { exportName, binding } of exportedFunctions) {
    if (combinedKeys.has(binding) || usedAsGradient.has(binding) || objectivesByTag.has(binding)) continue;
    const gradient = gradientNamesFor(exportName)
      .map((name) => ({ name, binding: bindings.byExportName.get(name) }))
      .find((candidate) => candidate.binding?.fn && candidate.binding !== binding && !usedAsGradient.has(candidate.binding) && !combinedKeys.has(candidate.binding));
    if (!gradient?.binding) continue;
    usedAsGradient.add(gradient.binding);
    matches.push(pairOf({ name: exportName, binding }, { name: gradient.name, binding: gradient.binding }, 'name', []));
  }

  for (const { exportName, binding } of exportedFunctions) {
    const gradientKey = combinedKeys.get(binding);
    if (!gradientKey || usedAsGradient.has(binding)) continue;
    matches.push({ objective: { name: exportName, binding }, gradient: null, combined: { valueKey: combinedValueKey, gradientKey }, matchedBy: 'combined', findings: [] });
  }

  matches.sort((a, b) => a.objective.binding.nameNode.pos - b.objective.binding.nameNode.pos);
  return { matches, fileFindings };
}

function pairOf(objective: MatchedFunction, gradient: MatchedFunction, matchedBy: PairMatch['matchedBy'], findings: Finding[]): PairMatch {
  return { objective, gradient, combined: null, matchedBy, findings };
}

/**
 * The gradient key when the function returns value and gradient together: by tag, by name,
 * or by a declared return type with `value` and `gradient`/`grad`. Null when it is not combined.
 */
function combinedGradientKey(exportName: string, binding: TopLevelBinding, types: TypeDeclarations): string | null {
  const fn = binding.fn!;
  const declaredKeys = objectTypeKeys(returnType(fn), types);
  const keyIn = (keys: string[] | null) => (keys?.includes(combinedValueKey) ? combinedGradientKeys.find((key) => keys.includes(key)) : undefined);
  const declaredKey = keyIn(declaredKeys);
  if (declaredKey) return declaredKey;
  if (!hasTag(binding.docHost, tagNames.valueAndGradient) && !isCombinedName(exportName)) return null;
  return keyIn(returnedObjectKeys(fn)) ?? combinedGradientKeys[0];
}
