// Version and locations of the built programs, for the CLI and the server.
import * as path from 'node:path';
import packageJson from '../../../package.json';

export const productVersion: string = packageJson.version;

/** dist/sandbox.js sits beside whichever dist/ program is running. */
export function sandboxScriptPath(distFolder: string = __dirname): string {
  return path.join(distFolder, 'sandbox.js');
}
