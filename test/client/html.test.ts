// The report page's shell: a strict Content-Security-Policy with a nonce, no
// inline script, nothing fetched from the network.
import assert from 'node:assert/strict';
import { randomBytes } from 'node:crypto';
import { test } from 'node:test';
import { nonceFromBytes, reportShellHtml } from '../../client/src/report/html';

const nonce = nonceFromBytes(randomBytes(16));
// Stand-ins for webview.cspSource and asWebviewUri(dist/report.js); the real ones come from VS Code.
const cspSource = 'vscode-webview-resource:';
const html = reportShellHtml({ cspSource, nonce, scriptUri: 'vscode-webview-resource://extension/dist/report.js', title: 'Gradient report: loss<&>' });

test('the policy denies everything but the nonce-bearing script and style and local images', () => {
  const attribute = html.match(/<meta http-equiv="Content-Security-Policy" content="([^"]*)">/)?.[1];
  assert.ok(attribute, 'a CSP meta tag');
  // The attribute as the browser decodes it.
  const policy = attribute.replace(/&#39;/g, "'").replace(/&quot;/g, '"').replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&amp;/g, '&');
  const directives = Object.fromEntries(policy.split(';').map((d) => d.trim().split(/\s+/)).map(([name, ...values]) => [name, values]));
  assert.deepEqual(directives['default-src'], ["'none'"]);
  assert.deepEqual(directives['script-src'], [`'nonce-${nonce}'`]);
  assert.deepEqual(directives['style-src'], [cspSource, `'nonce-${nonce}'`]);
  assert.deepEqual(directives['img-src'], [cspSource, 'data:']);
  assert.doesNotMatch(policy, /unsafe-inline|unsafe-eval|\*/);
  assert.equal(policy, `default-src 'none'; script-src 'nonce-${nonce}'; style-src ${cspSource} 'nonce-${nonce}'; img-src ${cspSource} data:`);
});

test('every script and style carries the nonce; the script is a file, not inline code', () => {
  const scripts = [...html.matchAll(/<script\b([^>]*)>([\s\S]*?)<\/script>/g)];
  assert.equal(scripts.length, 1);
  for (const [, attributes, body] of scripts) {
    assert.match(attributes, new RegExp(`nonce="${nonce.replace(/[+/]/g, '\\$&')}"`));
    assert.match(attributes, /src="vscode-webview-resource:\/\/extension\/dist\/report\.js"/);
    assert.equal(body.trim(), '', 'no inline code');
  }
  const styles = [...html.matchAll(/<style\b([^>]*)>/g)];
  assert.equal(styles.length, 1);
  assert.ok(styles.every(([, attributes]) => attributes.includes(`nonce="${nonce}"`)));
  assert.doesNotMatch(html, /\son[a-z]+=/i, 'no inline event handlers');
  assert.doesNotMatch(html, /style="/, 'no inline style attributes');
});

test('no network address, the root element for the report, the title escaped', () => {
  assert.doesNotMatch(html, /https?:\/\//);
  assert.match(html, /<main id="report-root"/);
  assert.match(html, /<title>Gradient report: loss&lt;&amp;&gt;<\/title>/);
  assert.doesNotMatch(html, /loss<&>/);
});

test('the stylesheet uses only theme colours', () => {
  const css = html.match(/<style[^>]*>([\s\S]*?)<\/style>/)![1];
  assert.doesNotMatch(css, /#[0-9a-f]{3,8}\b|rgb\(|hsl\(/i, 'no fixed colours: light and dark themes both apply');
  for (const variable of ['--vscode-foreground', '--vscode-editor-background', '--vscode-charts-red', '--vscode-charts-green', '--vscode-charts-blue', '--vscode-charts-yellow']) {
    assert.ok(css.includes(`var(${variable})`), variable);
  }
});

test('nonces are 128-bit base64 and differ between pages', () => {
  assert.match(nonce, /^[A-Za-z0-9+/]{22}$/);
  assert.notEqual(nonceFromBytes(randomBytes(16)), nonceFromBytes(randomBytes(16)));
  assert.throws(() => nonceFromBytes(new Uint8Array(8)));
});
