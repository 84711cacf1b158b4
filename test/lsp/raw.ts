/**
 * A raw connection to the built server for the stream and lifecycle tests: bytes go to its stdin as
 * they are (broken frames included), and what it sends back is read by the protocol library's own
 * reader, so answers are waited for by id and log lines by pattern, never with sleeps.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { StreamMessageReader, type Message, type ResponseMessage } from 'vscode-languageserver-protocol/node';
import { SERVER } from './client';

/** A spawned server spoken to in raw bytes. */
export interface RawServer {
  child: ChildProcess;
  /** Writes bytes (or a string as UTF-8) to the server's stdin as they are. */
  write(bytes: string | Buffer): void;
  /** Writes one well-formed frame carrying `message`. */
  send(message: object): void;
  /** Sends a request and resolves with its response. */
  request(id: number, method: string, params?: unknown): Promise<ResponseMessage>;
  /** Resolves with the first log line (window/logMessage) matching `re`. */
  log(re: RegExp): Promise<string>;
  logs: string[];
  exited: Promise<number | null>;
  kill(): Promise<void>;
}

/** A frame around `body` with a correct Content-Length. */
export function frame(message: object): string {
  const body = JSON.stringify(message);
  return `Content-Length: ${Buffer.byteLength(body, 'utf8')}\r\n\r\n${body}`;
}

/** Spawns `node dist/server.js --stdio`. */
export function rawServer(): RawServer {
  const child = spawn(process.execPath, [SERVER, '--stdio'], { stdio: ['pipe', 'pipe', 'pipe'] });
  const exited = new Promise<number | null>((r) => child.once('exit', (code) => r(code)));
  child.stdin!.on('error', () => undefined);
  const responses = new Map<number | string, ResponseMessage>();
  const waiting = new Map<number | string, (r: ResponseMessage) => void>();
  const logs: string[] = [];
  const logWaiters: { re: RegExp; resolve: (l: string) => void }[] = [];
  new StreamMessageReader(child.stdout!).listen((m: Message) => {
    const msg = m as Partial<ResponseMessage> & { method?: string; params?: { message?: string } };
    if (msg.method === 'window/logMessage') {
      const line = msg.params?.message ?? '';
      logs.push(line);
      for (const w of [...logWaiters]) if (w.re.test(line)) logWaiters.splice(logWaiters.indexOf(w), 1) && w.resolve(line);
    } else if (msg.id !== undefined && msg.id !== null && msg.method === undefined) {
      responses.set(msg.id, msg as ResponseMessage);
      waiting.get(msg.id)?.(msg as ResponseMessage);
    }
  });
  const write = (bytes: string | Buffer): void => void child.stdin!.write(bytes);
  const send = (message: object): void => write(frame(message));
  return {
    child,
    write,
    send,
    logs,
    exited,
    request: (id, method, params) => {
      const answer = new Promise<ResponseMessage>((resolve) => {
        const seen = responses.get(id);
        if (seen) resolve(seen);
        else waiting.set(id, resolve);
      });
      send({ jsonrpc: '2.0', id, method, params });
      return answer;
    },
    log: (re) => {
      const seen = logs.find((l) => re.test(l));
      return seen !== undefined ? Promise.resolve(seen) : new Promise((resolve) => logWaiters.push({ re, resolve }));
    },
    kill: async () => {
      if (child.exitCode === null) child.kill('SIGKILL');
      await exited;
    },
  };
}

/** The initialize parameters of a minimal client. */
export const INIT = { processId: process.pid, rootUri: null, capabilities: {} };
