// SARIF 2.1.0 (OASIS standard) log of a CLI run, for code-scanning services.
// Printed to stdout, so printableLines escapes what a terminal would obey (as formatJson).
import * as path from 'node:path';
import { pathToFileURL } from 'node:url';
import { findingSpan } from '../check/checkDocument';
import { allFindingCodes, findingTitles } from '../check/codes';
import type { SourceSpan } from '../discovery/types';
import type { Finding, Severity } from '../engine/types';
import type { FileOutcome } from './outcome';
import { printableLines } from '../shared/plainText';

const sarifLevel: Record<Severity, 'error' | 'warning' | 'note'> = { error: 'error', warning: 'warning', info: 'note' };

export function formatSarif(outcomes: FileOutcome[], meta: { version: string; cwd: string }): string {
  const results: object[] = [];
  for (const outcome of outcomes) {
    const check = outcome.check;
    if (!check) continue;
    for (const finding of check.fileFindings) results.push(result(finding, outcome.path, spanRegion(finding.span)));
    for (const { pair, report } of check.pairs) {
      for (const finding of report.findings) {
        const where = finding.location
          ? { file: relativeTo(meta.cwd, finding.location.file), region: { startLine: finding.location.line, startColumn: Math.max(1, finding.location.column) } }
          : { file: outcome.path, region: spanRegion(findingSpan(pair, finding)) };
        results.push(result(finding, where.file, where.region, pair.key));
      }
    }
  }
  const unreadable = outcomes.filter((o) => o.error);
  const log = JSON.stringify(
    {
      $schema: 'https://json.schemastore.org/sarif-2.1.0.json',
      version: '2.1.0',
      runs: [
        {
          tool: {
            driver: {
              name: 'Slopecheck',
              version: meta.version,
              // No link: a code-scanning service shows the rule's own text; the README ships with the tool.
              rules: allFindingCodes.map((code) => ({
                id: code,
                shortDescription: { text: findingTitles[code] },
                help: { text: `${findingTitles[code]} See the section \`${code}\` under Findings in the README that ships with Slopecheck.` },
              })),
            },
          },
          originalUriBaseIds: { SRCROOT: { uri: pathToFileURL(meta.cwd + path.sep).href } },
          invocations: [
            {
              executionSuccessful: unreadable.length === 0,
              toolExecutionNotifications: unreadable.map((o) => ({
                level: 'error',
                message: { text: `${o.path}: ${o.error}` },
              })),
            },
          ],
          results,
        },
      ],
    },
    null,
    2,
  );
  return printableLines(log);
}

function result(finding: Finding, file: string, region: object, logicalName?: string): object {
  return {
    ruleId: finding.code,
    ruleIndex: allFindingCodes.indexOf(finding.code),
    level: sarifLevel[finding.severity],
    message: { text: finding.message },
    locations: [
      {
        physicalLocation: { artifactLocation: { uri: toUri(file), uriBaseId: 'SRCROOT' }, region },
        ...(logicalName ? { logicalLocations: [{ name: logicalName, kind: 'function' }] } : {}),
      },
    ],
  };
}

function spanRegion(span: SourceSpan): object {
  return { startLine: span.startLine + 1, startColumn: span.startCharacter + 1, endLine: span.endLine + 1, endColumn: span.endCharacter + 1 };
}

function relativeTo(cwd: string, file: string): string {
  return path.isAbsolute(file) ? path.relative(cwd, file) : file;
}

/** A relative URI reference with forward slashes and escaped characters. */
function toUri(file: string): string {
  return file.split(path.sep).map(encodeURIComponent).join('/');
}
