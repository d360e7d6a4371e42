// Language server entry (dist/server.js). Editor features arrive in the next
// milestone; for now it answers initialize so clients can connect.
import { createConnection, ProposedFeatures, TextDocumentSyncKind } from 'vscode-languageserver/node';
import { productVersion } from '../shared/productInfo';

const connection = createConnection(ProposedFeatures.all);

connection.onInitialize(() => ({
  capabilities: { textDocumentSync: TextDocumentSyncKind.Incremental },
  serverInfo: { name: 'slopecheck', version: productVersion },
}));

connection.listen();
