// The browser page of the report; type-checked with the DOM library by tsconfig.webview.json.
// The report page's script (dist/report.js, loaded by nonce). It receives the
// report by postMessage and inserts the HTML that render.ts builds; buttons
// post messages back, since the page itself may not touch the clipboard or the editor.
import type { FromWebview, ToWebview } from './messages';
import { renderFailure, renderLoading, renderReportOrFailure } from './render';

declare function acquireVsCodeApi(): { postMessage(message: FromWebview): void };

const vscode = acquireVsCodeApi();
const root = document.getElementById('report-root')!;

window.addEventListener('message', (event: MessageEvent<ToWebview>) => {
  const message = event.data;
  switch (message.type) {
    case 'loading':
      root.innerHTML = renderLoading(message.objective);
      break;
    case 'report':
      root.innerHTML = renderReportOrFailure(message.result);
      break;
    case 'failed':
      root.innerHTML = renderFailure(message.objective, message.message);
      break;
  }
});

// Inline handlers are blocked by the policy, so one listener serves every button.
root.addEventListener('click', (event) => {
  const action = (event.target as Element | null)?.closest('[data-action]')?.getAttribute('data-action');
  if (action === 'copy-json') vscode.postMessage({ type: 'copyJson' });
  if (action === 'check-again') vscode.postMessage({ type: 'checkAgain' });
});

// The page is rebuilt whenever the panel is shown again; ask for the data each time.
vscode.postMessage({ type: 'ready' });
