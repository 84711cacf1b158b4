/**
 * Entry point of the bundled language server (dist/server.js): `--stdio`, `--node-ipc` or
 * `--socket=PORT`, chosen by `createConnection` from the command line. The connection library exits
 * the process when the client's stdio closes or its process (initialize `processId`) disappears; the
 * IPC channel closing is handled here, so no orphan stays behind in any transport.
 */
import { createConnection } from 'vscode-languageserver/node';
import { join } from 'node:path';
import { startServer } from './server';

const connection = createConnection();
// Over node IPC the stream-end hook of the library does not apply: a closed channel means the client is gone.
if (typeof process.send === 'function') process.on('disconnect', () => process.exit(1));
startServer(connection, { workerPath: join(__dirname, 'worker.js') });
