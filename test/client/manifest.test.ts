// package.json against the code: settings mirror defaultSettings and readSettings'
// ranges, commands are complete and named alike, the server's code-lens commands exist.
import assert from 'node:assert/strict';
import { readdirSync, readFileSync } from 'node:fs';
import * as path from 'node:path';
import { describe, test } from 'node:test';
import { commandIds } from '../../client/src/commandIds';
import { checkedLanguages } from '../../client/src/languages';
import { defaultSettings, readSettings, type SlopecheckSettings } from '../../server/src/shared/settings';
import { repoRoot } from '../support/paths';

interface SettingSchema {
  type: string;
  default: unknown;
  minimum?: number;
  maximum?: number;
  enum?: string[];
  enumDescriptions?: string[];
  markdownDescription?: string;
  scope?: string;
}

const manifest = JSON.parse(readFileSync(path.join(repoRoot, 'package.json'), 'utf8'));
const properties: Record<string, SettingSchema> = manifest.contributes.configuration.properties;
const commands: Array<{ command: string; title: string; category: string }> = manifest.contributes.commands;
const integerSettings = new Set(['probeCount', 'seed', 'fullCheckMaxDimension']);

/** What readSettings makes of a lone value for one key. */
const read = (key: keyof SlopecheckSettings, value: unknown) => readSettings({ [key]: value })[key];

describe('settings', () => {
  test('one setting per field, nothing else', () => {
    assert.deepEqual(Object.keys(properties).sort(), Object.keys(defaultSettings).map((key) => `slopecheck.${key}`).sort());
    assert.equal(manifest.contributes.configuration.title, 'Slopecheck');
  });

  for (const key of Object.keys(defaultSettings) as Array<keyof SlopecheckSettings>) {
    test(`${key}: default, type, description and range agree with the code`, () => {
      const schema = properties[`slopecheck.${key}`];
      assert.deepEqual(schema.default, defaultSettings[key]);
      assert.ok((schema.markdownDescription ?? '').length > 30, 'a clear description');
      if (typeof defaultSettings[key] === 'string') {
        assert.equal(schema.type, 'string');
        assert.ok(schema.enum?.includes(defaultSettings[key] as string));
        assert.equal(schema.enumDescriptions?.length, schema.enum!.length);
        for (const value of schema.enum!) assert.equal(read(key, value), value, `readSettings keeps ${value}`);
        assert.equal(read(key, 'sometimes'), defaultSettings[key], 'readSettings rejects values outside the enum');
        return;
      }
      assert.equal(schema.type, integerSettings.has(key) ? 'integer' : 'number');
      const { minimum, maximum } = schema;
      assert.ok(typeof minimum === 'number' && typeof maximum === 'number', 'bounded');
      // The manifest's bounds are accepted by readSettings and a hair beyond them is not.
      const nudge = (bound: number) => Math.max(1e-6, Math.abs(bound) * 1e-9);
      assert.equal(read(key, minimum), minimum);
      assert.equal(read(key, maximum), maximum);
      assert.equal(read(key, minimum - nudge(minimum)), defaultSettings[key], `below ${minimum} falls back`);
      assert.equal(read(key, maximum + nudge(maximum)), defaultSettings[key], `above ${maximum} falls back`);
    });
  }

  // VS Code reads a `machine` setting from user (or remote machine) settings only; `machine-overridable`
  // and the wider scopes let workspace and folder settings override it.
  test('settings that change how code is executed cannot be set by a workspace, and say so', () => {
    const executing = ['timeoutMs', 'memoryMb'];
    for (const key of executing) {
      const schema = properties[`slopecheck.${key}`];
      assert.equal(schema.scope, 'machine', key);
      assert.match(schema.markdownDescription ?? '', /Only your user settings/, key);
      assert.match(schema.markdownDescription ?? '', /workspace or folder settings is ignored/, key);
    }
  });
});

describe('commands', () => {
  test('exactly the commands the client registers, each with the category and a title', () => {
    assert.deepEqual(commands.map((c) => c.command).sort(), Object.values(commandIds).sort());
    for (const command of commands) {
      assert.match(command.command, /^slopecheck\.[a-z][A-Za-z]+$/);
      assert.equal(command.category, 'Slopecheck', command.command);
      assert.ok(command.title.length > 3, command.command);
    }
  });

  test('palette entries name existing commands and apply to TypeScript and JavaScript editors', () => {
    const palette: Array<{ command: string; when: string }> = manifest.contributes.menus.commandPalette;
    for (const entry of palette) {
      assert.ok(Object.values(commandIds).includes(entry.command as never), entry.command);
      for (const language of checkedLanguages) assert.ok(entry.when.split(' || ').includes(`editorLangId == ${language}`), `${entry.command}: ${language}`);
    }
    assert.ok(palette.some((entry) => entry.command === commandIds.checkObjective));
  });

  test("every command the server's code lenses name exists", () => {
    const lspFolder = path.join(repoRoot, 'server', 'src', 'lsp');
    const sources = readdirSync(lspFolder, { recursive: true, encoding: 'utf8' })
      .filter((file) => file.endsWith('.ts'))
      .map((file) => readFileSync(path.join(lspFolder, file), 'utf8'));
    const named = new Set(sources.flatMap((text) => [...text.matchAll(/['"`](slopecheck\.[A-Za-z]+)['"`]/g)].map((m) => m[1])));
    // The code lens opens a pair's report; it must exist whatever the server's source names today.
    named.add(commandIds.openReport);
    const contributed = new Set(commands.map((c) => c.command));
    for (const id of named) assert.ok(contributed.has(id), `${id} is named by the server but not contributed`);
  });
});

describe('activation and trust', () => {
  test('activates on every checked language (TypeScript and JavaScript, with JSX too) and runs dist/extension.js', () => {
    assert.deepEqual([...manifest.activationEvents].sort(), checkedLanguages.map((language) => `onLanguage:${language}`).sort());
    assert.ok(manifest.activationEvents.includes('onLanguage:typescriptreact'));
    assert.equal(manifest.main, './dist/extension.js');
  });

  test('declares that it runs workspace code and checks nothing in Restricted Mode', () => {
    const trust = manifest.capabilities.untrustedWorkspaces;
    assert.equal(trust.supported, 'limited');
    assert.match(trust.description, /run/i);
    assert.match(trust.description, /Restricted Mode/);
  });

  test('the report script is built for the browser', () => {
    const build = readFileSync(path.join(repoRoot, 'esbuild.mjs'), 'utf8');
    assert.match(build, /client\/src\/report\/webview\.ts'[^}]*outfile: 'dist\/report\.js'[^}]*platform: 'browser'[^}]*format: 'iife'/);
  });
});
