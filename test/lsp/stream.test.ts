/**
 * The stream (LSP 3.17 "Base Protocol": `Content-Length: N\r\n\r\n` then N bytes): after each kind of
 * broken frame, written as raw bytes to a spawned server, a later valid request is answered; a frame
 * announcing more than the cap is skipped without being buffered (checked in process on the reader).
 */
import { afterEach, describe, expect, it } from 'vitest';
import { EventEmitter } from 'node:events';
import { spawn } from 'node:child_process';
import { mkdtempSync, readFileSync } from 'node:fs';
import { createServer, type AddressInfo, type Server, type Socket } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { StreamMessageReader } from 'vscode-languageserver-protocol/node';
import { SERVER } from './client';
import { ErrorCodes } from 'vscode-languageserver-protocol';
import { FrameReader, MAX_FRAME_BYTES } from '../../server/src/lsp/frames';
import { LIMIT_RANGES } from '../../server/src/analysis/index';
import { frame, INIT, rawServer, type RawServer } from './raw';

const servers: RawServer[] = [];
afterEach(async () => {
  await Promise.all(servers.splice(0).map((s) => s.kill()));
});

const hover = { textDocument: { uri: 'file:///stream/none.qstate' }, position: { line: 0, character: 0 } };
const request = (id: number): object => ({ jsonrpc: '2.0', id, method: 'textDocument/hover', params: hover });

/** Broken frames, each followed by nothing else. */
const BROKEN: [string, string | Buffer][] = [
  ['a length that is not a number', 'Content-Length: abc\r\n\r\n{}'],
  ['no length at all', 'Content-Type: application/vscode-jsonrpc; charset=utf-8\r\n\r\n{}'],
  ['a negative length', `Content-Length: -5\r\n\r\n${JSON.stringify(request(90))}`],
  ['headers ended by LF only', `Content-Length: 2\n\n{}`],
  ['a length too short for its body', `Content-Length: 9\r\n\r\n${JSON.stringify(request(91))}`],
  ['a length too long for the cap, with 1 MB of its body', Buffer.concat([Buffer.from(`Content-Length: ${MAX_FRAME_BYTES + 1}\r\n\r\n`), Buffer.alloc(1 << 20, 0x78)])],
  ['an unknown charset', 'Content-Length: 2\r\nContent-Type: application/vscode-jsonrpc; charset=latin-9\r\n\r\n{}'],
  ['a header block without an end', 'X'.repeat(20_000)],
];

describe('broken frames', () => {
  it.each(BROKEN)('after %s, the next valid request is answered', async (_name, bytes) => {
    const s = rawServer();
    servers.push(s);
    const init = await s.request(1, 'initialize', INIT);
    expect(init.error).toBeUndefined();
    s.send({ jsonrpc: '2.0', method: 'initialized', params: {} });
    s.write(bytes);
    const r = await s.request(2, 'textDocument/hover', hover);
    expect(r.error).toBeUndefined();
    expect(r.result).toBeNull();
    // The bad frame's own request (if any) was never answered, and the server is still running.
    expect(s.child.exitCode).toBeNull();
    await s.log(/bad message frame/);
  });

  it('reads frames split at every byte and frames sharing one chunk', async () => {
    const s = rawServer();
    servers.push(s);
    const bytes = Buffer.from(frame({ jsonrpc: '2.0', id: 1, method: 'initialize', params: INIT }));
    for (let k = 0; k < bytes.length; k++) s.write(bytes.subarray(k, k + 1));
    expect((await s.request(0, 'shutdown')).id).toBe(0);
    s.write(frame(request(3)) + frame(request(4)));
    const [a, b] = await Promise.all([s.request(5, 'textDocument/hover', hover), s.request(6, 'textDocument/hover', hover)]);
    // After shutdown every request is refused, in order (LSP 3.17 "shutdown").
    expect([a.error?.code, b.error?.code]).toEqual([ErrorCodes.InvalidRequest, ErrorCodes.InvalidRequest]);
  });
});

/** Resident memory of a process in MB, from /proc (Linux). */
function rssMb(pid: number): number {
  const m = /VmRSS:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
  if (!m) throw new Error('no VmRSS in /proc status');
  return Number(m[1]) / 1024;
}

describe('a huge announced length', () => {
  it('buffers nothing: 128 MB sent after Content-Length 10^11 leave the server within 48 MB of where it was', { timeout: 120_000 }, async () => {
    const s = rawServer();
    servers.push(s);
    await s.request(1, 'initialize', INIT);
    const before = rssMb(s.child.pid!);
    s.write('Content-Length: 100000000000\r\n\r\n');
    const mb = Buffer.alloc(1 << 20, 0x78);
    for (let k = 0; k < 128; k++) {
      // Wait for the pipe to drain every few MB, so the server really reads the bytes (no sleep: the drain event).
      if (!s.child.stdin!.write(mb)) await new Promise((r) => s.child.stdin!.once('drain', r));
    }
    const r = await s.request(2, 'textDocument/hover', hover);
    expect(r.result).toBeNull();
    const after = rssMb(s.child.pid!);
    console.log(`server RSS ${before.toFixed(1)} MB before, ${after.toFixed(1)} MB after 128 MB of an oversized frame`);
    // Bound (stated): the 128 MB are skipped, not kept; 48 MB allow for garbage collection timing.
    expect(after - before).toBeLessThan(48);
  });
});

describe('socket and pipe transports', () => {
  const cases: [string, (server: Server) => Promise<string[]>][] = [
    ['--socket=PORT', (server) => new Promise((r) => server.listen(0, '127.0.0.1', () => r([`--socket=${(server.address() as AddressInfo).port}`])))],
    ['--pipe NAME', (server) => {
      const name = join(mkdtempSync(join(tmpdir(), 'eigenspan-pipe-')), 'lsp.sock');
      return new Promise((r) => server.listen(name, () => r(['--pipe', name])));
    }],
  ];
  it.each(cases)('%s: the server connects, reads frames with the same reader and recovers after a bad one', async (_name, listen) => {
    const server = createServer();
    const connected = new Promise<Socket>((r) => server.once('connection', r));
    const args = await listen(server);
    const child = spawn(process.execPath, [SERVER, ...args], { stdio: ['ignore', 'ignore', 'pipe'] });
    try {
      const socket = await connected;
      type Answer = { id?: number; method?: string; error?: unknown };
      const answers: Answer[] = [];
      // Log notifications come too; only the answers count.
      const got = new Promise<void>((done) =>
        new StreamMessageReader(socket).listen((m) => {
          const a = m as unknown as Answer;
          if (a.method === undefined && a.id !== undefined) answers.push(a);
          if (answers.length === 2) done();
        }),
      );
      socket.write(frame({ jsonrpc: '2.0', id: 1, method: 'initialize', params: INIT }));
      socket.write('Content-Length: abc\r\n\r\n' + frame(request(2)));
      await got;
      expect(answers.map((a) => [a.id, a.error === undefined])).toEqual([[1, true], [2, true]]);
    } finally {
      child.kill('SIGKILL');
      server.close();
    }
  });
});

describe('the frame reader', () => {
  it('caps a frame at 6 x the largest maxFileBytes + 64 KiB (every byte of a file as \\u00XX, derived in this comment)', () => {
    expect(MAX_FRAME_BYTES).toBe(6 * LIMIT_RANGES.maxFileBytes[1] + 65_536);
  });

  it('skips an oversized frame while holding only a few bytes, then reads the next one', () => {
    // A stream stand-in that delivers each write at once.
    const stream = new EventEmitter();
    const input = { write: (b: string | Buffer) => stream.emit('data', typeof b === 'string' ? Buffer.from(b) : b) };
    const logs: string[] = [];
    const reader = new FrameReader(stream as unknown as NodeJS.ReadableStream, (m) => logs.push(m), 1000);
    const got: unknown[] = [];
    reader.listen((m) => got.push(m));
    input.write(`Content-Length: 1001\r\n\r\n`);
    for (let k = 0; k < 100; k++) {
      input.write(Buffer.alloc(10_000, 0x61));
      expect(reader.buffered).toBeLessThan(64);
    }
    input.write(frame({ jsonrpc: '2.0', id: 7, method: 'x' }));
    expect(got).toEqual([{ jsonrpc: '2.0', id: 7, method: 'x' }]);
    // A frame of exactly the cap is read.
    const body = JSON.stringify({ jsonrpc: '2.0', method: 'y', params: 'z'.repeat(1000 - 42) });
    expect(Buffer.byteLength(body)).toBe(1000);
    input.write(`Content-Length: 1000\r\n\r\n${body}`);
    expect(got).toHaveLength(2);
    expect(logs.length).toBeGreaterThan(0);
  });
});
