// Language server entry (dist/server.js). The transport comes from argv:
// --node-ipc for the VS Code client, --stdio for other editors.
import './heapTuning';
import { createConnection, ProposedFeatures } from 'vscode-languageserver/node';
import { startServer } from './server';

startServer(createConnection(ProposedFeatures.all));
