// Probe points and dimension from JSDoc: `@probe [1, 2.5, -3]`, `@probe namedConst`, `@dimension N`.
import * as ts from 'typescript';
import type { Finding } from '../engine/types';
import { tagNames } from './conventions';
import type { ModuleBindings } from './exports';
import { firstWord, readTags, type TagReading } from './tags';
import type { SourceSpan } from './types';

export interface ProbeReading {
  probes: number[][];
  /** Names of module-level consts holding probe points (scope keys). */
  probeKeys: string[];
  tagSpans: SourceSpan[];
  /** From `@dimension N`, if given and readable. */
  declaredDimension: number | null;
  findings: Finding[];
}

const expectedForm = 'Write a JSON array of finite numbers, e.g. /** @probe [0.5, -1, 2] */, or the name of a const of this file that holds one.';

/** Reads the probe and dimension tags of every host (objective first, then gradient) and merges them. */
export function readProbeTags(sourceFile: ts.SourceFile, hosts: ts.Node[], bindings: ModuleBindings): ProbeReading {
  const reading: ProbeReading = { probes: [], probeKeys: [], tagSpans: [], declaredDimension: null, findings: [] };
  for (const host of hosts) {
    for (const tag of readTags(sourceFile, host, tagNames.probe)) {
      reading.tagSpans.push(tag.span);
      readProbe(tag, bindings, reading);
    }
    for (const tag of readTags(sourceFile, host, tagNames.dimension)) {
      if (reading.declaredDimension !== null) continue;
      if (/^[1-9]\d*$/.test(firstWord(tag.text))) reading.declaredDimension = Number(firstWord(tag.text));
      else reading.findings.push(badProbe(`\`@dimension ${tag.text}\` needs a positive whole number of parameters, e.g. /** @dimension 10 */.`));
    }
  }
  const lengths = new Set(reading.probes.map((probe) => probe.length));
  if (lengths.size > 1) {
    reading.findings.push(badProbe(`The probe points have different numbers of coordinates (${[...lengths].join(', ')}); every @probe must have as many as the objective takes.`));
  }
  return reading;
}

function readProbe(tag: TagReading, bindings: ModuleBindings, reading: ProbeReading): void {
  const text = tag.text;
  if (text === '') {
    reading.findings.push(badProbe(`\`@probe\` is empty. ${expectedForm}`));
  } else if (text.startsWith('[')) {
    const point = parsePoint(text);
    if (typeof point === 'string') reading.findings.push(badProbe(`\`@probe ${oneLine(text)}\` cannot be read: ${point}. ${expectedForm}`));
    else reading.probes.push(point);
  } else if (/^[A-Za-z_$][\w$]*$/.test(text)) {
    readNamedProbe(text, bindings, reading);
  } else {
    reading.findings.push(badProbe(`\`@probe ${oneLine(text)}\` is neither a point nor a name. ${expectedForm}`));
  }
}

function readNamedProbe(name: string, bindings: ModuleBindings, reading: ProbeReading): void {
  const binding = bindings.byLocalName.get(name);
  if (binding?.constValue || binding?.kind === 'import') {
    if (!reading.probeKeys.includes(name)) reading.probeKeys.push(name);
  } else if (binding) {
    reading.findings.push(badProbe(`\`@probe ${name}\` names a ${binding.kind}; it must name a const holding a point. ${expectedForm}`));
  } else {
    reading.findings.push(badProbe(`\`@probe ${name}\`: this file has no const named \`${name}\`. ${expectedForm}`));
  }
}

/** The point, or a description of what is wrong with it. */
function parsePoint(text: string): number[] | string {
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch {
    return 'it is not valid JSON';
  }
  if (!Array.isArray(value)) return 'it is not an array';
  if (value.length === 0) return 'it has no coordinates';
  const bad = value.findIndex((coordinate) => typeof coordinate !== 'number' || !Number.isFinite(coordinate));
  if (bad >= 0) return `coordinate ${bad} (${JSON.stringify(value[bad])}) is not a finite number`;
  return value as number[];
}

/**
 * The dimension the sandbox should use: the tuple type's length, else `@dimension`, else the
 * probes' length. Disagreement between the sources is reported, since one of them is wrong.
 */
export function settleDimension(typeDimension: number | null, reading: ProbeReading): { dimension: number | null; findings: Finding[] } {
  const findings: Finding[] = [];
  const declared = reading.declaredDimension;
  if (typeDimension !== null && declared !== null && typeDimension !== declared) {
    findings.push(badProbe(`\`@dimension ${declared}\` disagrees with the parameter type, which has ${typeDimension} coordinates.`));
  }
  const dimension = typeDimension ?? declared;
  const probeLength = reading.probes[0]?.length ?? null;
  if (dimension !== null && reading.probes.some((probe) => probe.length !== dimension)) {
    findings.push(badProbe(`A probe point has the wrong number of coordinates: the objective takes ${dimension}.`));
  }
  return { dimension: dimension ?? probeLength, findings };
}

function badProbe(message: string): Finding {
  return { code: 'bad-probe', severity: 'error', subject: 'probe', message };
}

function oneLine(text: string): string {
  return text.replace(/\s+/g, ' ');
}
