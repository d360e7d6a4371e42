// The editor languages Slopecheck checks, one list for the server's document selector, the status
// bar and (held to it by test/client/manifest.test.ts) the manifest's activation and menus.
export const checkedLanguages: readonly string[] = ['typescript', 'javascript', 'typescriptreact', 'javascriptreact'];
