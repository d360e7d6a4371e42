// The report panel's page: a shell with a strict Content-Security-Policy. The
// script is a file from dist/ allowed by its nonce; the data arrives later by
// postMessage, never inside the page. Pure, so the policy is tested under node.
import { escapeMarkup } from './format';
import { reportStyles } from './styles';

export interface ShellOptions {
  /** `webview.cspSource`: the origin of the webview's own resources. */
  cspSource: string;
  /** Random per page; only the script and style carrying it run. */
  nonce: string;
  /** `webview.asWebviewUri` of dist/report.js. */
  scriptUri: string;
  title: string;
}

export function contentSecurityPolicy(cspSource: string, nonce: string): string {
  return [
    "default-src 'none'",
    `script-src 'nonce-${nonce}'`,
    `style-src ${cspSource} 'nonce-${nonce}'`,
    `img-src ${cspSource} data:`,
  ].join('; ');
}

export function reportShellHtml({ cspSource, nonce, scriptUri, title }: ShellOptions): string {
  const attribute = escapeMarkup;
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="UTF-8">
<meta http-equiv="Content-Security-Policy" content="${attribute(contentSecurityPolicy(cspSource, nonce))}">
<meta name="viewport" content="width=device-width, initial-scale=1.0">
<title>${escapeMarkup(title)}</title>
<style nonce="${attribute(nonce)}">${reportStyles}</style>
</head>
<body>
<main id="report-root" aria-live="polite"><p class="loading">Waiting for the report…</p></main>
<script nonce="${attribute(nonce)}" src="${attribute(scriptUri)}"></script>
</body>
</html>
`;
}

/** A nonce from random bytes: base64 without padding, as CSP allows. */
export function nonceFromBytes(bytes: Uint8Array): string {
  if (bytes.length < 16) throw new Error('a nonce needs at least 128 bits');
  let binary = '';
  for (const byte of bytes) binary += String.fromCharCode(byte);
  return btoa(binary).replace(/=+$/, '');
}
