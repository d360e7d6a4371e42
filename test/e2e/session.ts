// One editor session for a test file: a demo copy, code-server with the packaged
// extension, and a browser on its workbench; `close` undoes all three.
import { readdirSync } from 'node:fs';
import * as path from 'node:path';
import { openBrowser, type BrowserSession } from './browser';
import { CodeServer } from './codeServer';
import { DemoWorkspace } from './demoWorkspace';
import { missingTools, setupHint } from './tools';
import { Workbench } from './workbench';

export interface EditorSession {
  demo: DemoWorkspace;
  /** The folder code-server installed the .vsix into. */
  installedExtension: string;
  workbench: Workbench;
  close(): Promise<void>;
}

/** test/e2e/run.mjs packages the extension and names the .vsix here. */
function packagedExtension(): string {
  const vsix = process.env.SLOPECHECK_E2E_VSIX;
  if (!vsix) throw new Error('SLOPECHECK_E2E_VSIX is not set: run the end-to-end tests with `npm run test:e2e`, which packages the extension first.');
  return vsix;
}

export async function openEditorSession(trusted: boolean): Promise<EditorSession> {
  const missing = missingTools();
  if (missing.length > 0) throw new Error(`End-to-end tools missing: ${missing.join(', ')}; ${setupHint}.`);
  const demo = DemoWorkspace.copy();
  let server: CodeServer | undefined;
  let browser: BrowserSession | undefined;
  const close = async () => {
    await browser?.close().catch(() => undefined);
    await server?.stop();
    demo.remove();
  };
  try {
    server = await CodeServer.start({ vsix: packagedExtension(), workspace: demo.folder, trusted });
    browser = await openBrowser();
    const workbench = new Workbench(browser.page);
    await workbench.open(server.url, 'src');
    return { demo, workbench, close, installedExtension: installedExtension(server.extensionsDir) };
  } catch (error) {
    await close();
    throw error;
  }
}

function installedExtension(extensionsDir: string): string {
  const folder = readdirSync(extensionsDir).find((name) => name.startsWith('slopecheck.slopecheck-'));
  if (!folder) throw new Error(`the packaged extension is not among the installed extensions in ${extensionsDir}`);
  return path.join(extensionsDir, folder);
}
