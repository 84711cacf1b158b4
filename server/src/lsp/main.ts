/**
 * Entry point of the bundled language server (dist/server.js): `--stdio`, `--node-ipc`, `--socket=PORT`
 * or `--pipe NAME` (transport.ts). The process exits when the client's stdio closes (transport.ts),
 * when its process (initialize `processId`) disappears (the connection library) or when the IPC channel
 * closes (here), so no orphan stays behind in any transport.
 */
import { createConnection, type Connection } from 'vscode-languageserver/node';
import { join } from 'node:path';
import { startServer } from './server';
import { guardStdio, openTransport } from './transport';

/** Until the connection exists, framing problems go to stderr. */
let log = (m: string): void => void process.stderr.write(`${m}\n`);
const transport = openTransport(process.argv.slice(2), (m) => log(m));
// Without a transport on the command line the library explains the options and stops.
const connection: Connection = transport ? createConnection(transport.reader, transport.writer) : createConnection();
log = (m) => connection.console.error(m);
if (transport?.stdio) guardStdio(connection, transport);
// Over node IPC the stream-end hook of the library does not apply: a closed channel means the client is gone.
if (typeof process.send === 'function') process.on('disconnect', () => process.exit(1));
startServer(connection, { workerPath: join(__dirname, 'worker.js'), sweepWorkerPath: join(__dirname, 'sweepWorker.js') });
