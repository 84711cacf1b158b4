/**
 * The server's transport, chosen from the command line as the protocol library does (`--stdio`,
 * `--node-ipc`, `--socket=PORT` or `--socket PORT`, `--pipe NAME`), but with the server's own frame
 * reader on every byte stream (frames.ts: caps and recovery after bad frames) and the lifecycle gate
 * (gate.ts) in front of every transport.
 */
import { createConnection as connectSocket } from 'node:net';
import { inspect } from 'node:util';
import { IPCMessageReader, IPCMessageWriter, StreamMessageWriter, type Connection, type MessageReader, type MessageWriter } from 'vscode-languageserver/node';
import { FrameReader } from './frames';
import { LifecycleGate } from './gate';

/** A transport: the gated reader, the writer, and whether stdio carries the protocol. */
export interface Transport {
  reader: LifecycleGate;
  writer: MessageWriter;
  stdio: boolean;
}

/** The value of `--name=V` or `--name V` in `argv`. */
function option(argv: string[], name: string): string | undefined {
  for (let k = 0; k < argv.length; k++) {
    if (argv[k] === name) return argv[k + 1];
    if (argv[k]!.startsWith(`${name}=`)) return argv[k]!.slice(name.length + 1);
  }
  return undefined;
}

/** Opens the transport `argv` asks for, or null when it names none. `log` receives framing problems. */
export function openTransport(argv: string[], log: (message: string) => void): Transport | null {
  let reader: MessageReader;
  let writer: MessageWriter;
  let stdio = false;
  const socketPort = option(argv, '--socket');
  const pipe = option(argv, '--pipe');
  if (argv.includes('--node-ipc')) {
    reader = new IPCMessageReader(process);
    writer = new IPCMessageWriter(process);
  } else if (argv.includes('--stdio')) {
    stdio = true;
    reader = new FrameReader(process.stdin, log);
    writer = new StreamMessageWriter(process.stdout);
  } else if (socketPort !== undefined || pipe !== undefined) {
    const socket = pipe !== undefined ? connectSocket(pipe) : connectSocket(Number(socketPort), '127.0.0.1');
    reader = new FrameReader(socket, log);
    writer = new StreamMessageWriter(socket);
  } else {
    return null;
  }
  return { reader: new LifecycleGate(reader, writer, log), writer, stdio };
}

/**
 * When stdio carries the protocol: exit when the client's end closes (code 0 after `shutdown`, else 1,
 * LSP 3.17 "exit"), and send console output to the client's log instead of stdout.
 */
export function guardStdio(connection: Connection, transport: Transport): void {
  const gone = (): never => process.exit(transport.reader.phase === 'shutdown' ? 0 : 1);
  process.stdin.on('end', gone);
  process.stdin.on('close', gone);
  const text = (args: unknown[]): string => args.map((a) => (typeof a === 'string' ? a : inspect(a))).join(' ');
  console.log = console.info = console.debug = (...args: unknown[]) => connection.console.log(text(args));
  console.warn = (...args: unknown[]) => connection.console.warn(text(args));
  console.error = (...args: unknown[]) => connection.console.error(text(args));
}
