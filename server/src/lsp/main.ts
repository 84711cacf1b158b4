/**
 * Entry point of the bundled language server (dist/server.js): `--stdio`, `--node-ipc` or
 * `--socket=PORT`, chosen by `createConnection` from the command line. The connection library exits
 * the process when the client's stream closes or its process disappears, so no orphan stays behind.
 */
import { createConnection } from 'vscode-languageserver/node';
import { join } from 'node:path';
import { startServer } from './server';

const connection = createConnection();
startServer(connection, { workerPath: join(__dirname, 'worker.js') });
