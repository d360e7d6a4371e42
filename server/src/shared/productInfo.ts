// Version and locations of the built programs, for the CLI and the server.
import * as path from 'node:path';
import { pathToFileURL } from 'node:url';
import packageJson from '../../../package.json';

export const productVersion: string = packageJson.version;

/**
 * The README shipped with the extension (one folder above dist/), as a file URL: where a
 * diagnostic's code links to, its section named by the code.
 */
export function shippedReadmeUrl(distFolder: string = __dirname): string {
  return pathToFileURL(path.join(distFolder, '..', 'README.md')).href;
}

/** dist/sandbox.js sits beside whichever dist/ program is running. */
export function sandboxScriptPath(distFolder: string = __dirname): string {
  return path.join(distFolder, 'sandbox.js');
}
