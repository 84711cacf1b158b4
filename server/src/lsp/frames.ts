/**
 * Reads base-protocol frames (`Content-Length: N\r\n\r\n` and N bytes of JSON, LSP 3.17 "Base
 * Protocol") from a byte stream, with a cap on a frame's size and recovery after a bad frame: a header
 * that is not CRLF-terminated, has no, a non-numeric, a negative or an oversized Content-Length, or an
 * unknown charset is logged, and the bytes up to the next `Content-Length:` are skipped (only a few
 * bytes are kept while skipping, so a huge announced length buffers nothing). A body that is not JSON
 * (for example because its length was too short) is logged and its leftover bytes are skipped the same
 * way. Used in front of the connection instead of the library's reader, which stops answering after
 * such a frame.
 */
import { AbstractMessageReader, Disposable, type DataCallback, type Message } from 'vscode-languageserver/node';
import { LIMIT_RANGES } from '../analysis/index';

/** The largest file the settings allow, after JSON escaping (at most 6 bytes per byte, `\u00XX`), plus room for the rest of the message. */
export const MAX_FRAME_BYTES = 6 * LIMIT_RANGES.maxFileBytes[1] + 64 * 1024;
/** Longest header block accepted (real headers are under 100 bytes). */
const MAX_HEADER_BYTES = 8 * 1024;

const HEADER_END = Buffer.from('\r\n\r\n', 'latin1');
const LENGTH_NAME = 'content-length:';

/** Why a header block is refused, or its Content-Length. */
function parseHeader(block: string, maxFrame: number): { length: number } | { problem: string } {
  let length: number | null = null;
  for (const line of block.split('\r\n')) {
    if (/[\r\n]/.test(line)) return { problem: 'a header line ends with a bare LF or CR (headers end with CRLF)' };
    const m = /^([A-Za-z0-9-]+):[ \t]*(.*?)[ \t]*$/.exec(line);
    if (!m) return { problem: `'${line.slice(0, 40)}' is not a header` };
    const name = m[1]!.toLowerCase();
    const value = m[2]!;
    if (name === 'content-length') {
      if (length !== null) return { problem: 'Content-Length is given twice' };
      if (!/^\d{1,16}$/.test(value)) return { problem: `Content-Length '${value.slice(0, 40)}' is not a whole number of bytes` };
      length = Number(value);
      if (length > maxFrame) return { problem: `Content-Length ${length} is over the cap of ${maxFrame} bytes` };
    } else if (name === 'content-type') {
      const charset = /charset\s*=\s*"?([^";\s]+)/i.exec(value)?.[1]?.toLowerCase();
      if (charset !== undefined && charset !== 'utf-8' && charset !== 'utf8') return { problem: `charset '${charset}' is not utf-8` };
    }
  }
  if (length === null) return { problem: 'no Content-Length header' };
  return { length };
}

/** A MessageReader over a byte stream that survives bad frames and caps their size. */
export class FrameReader extends AbstractMessageReader {
  /** Bytes of the header being read (or being skipped). */
  private head: Buffer = Buffer.alloc(0);
  /** Body bytes received so far, and how many the body has. */
  private parts: Buffer[] = [];
  private have = 0;
  private need = -1;
  /** True while skipping to the next `Content-Length:` after a bad frame; counts what was dropped. */
  private skipping = false;
  private skipped = 0;
  private callback: DataCallback | null = null;

  constructor(
    private readonly stream: NodeJS.ReadableStream,
    private readonly log: (message: string) => void,
    private readonly maxFrame = MAX_FRAME_BYTES,
  ) {
    super();
  }

  /** Bytes held right now (a partial header or body); stays small while a refused frame is skipped. */
  get buffered(): number {
    return this.head.length + this.have;
  }

  listen(callback: DataCallback): Disposable {
    this.callback = callback;
    const onData = (chunk: Buffer | string): void => this.onData(typeof chunk === 'string' ? Buffer.from(chunk, 'utf8') : chunk);
    const onError = (e: unknown): void => this.fireError(e);
    const onClose = (): void => this.fireClose();
    this.stream.on('data', onData);
    this.stream.on('error', onError);
    this.stream.on('end', onClose);
    this.stream.on('close', onClose);
    return Disposable.create(() => {
      this.callback = null;
      this.stream.off('data', onData);
      this.stream.off('error', onError);
      this.stream.off('end', onClose);
      this.stream.off('close', onClose);
    });
  }

  private onData(chunk: Buffer): void {
    if (this.need >= 0) {
      this.parts.push(chunk);
      this.have += chunk.length;
      if (this.have < this.need) return;
      const all = Buffer.concat(this.parts, this.have);
      const need = this.need;
      this.parts = [];
      this.have = 0;
      this.need = -1;
      this.deliver(all.subarray(0, need));
      this.head = all.subarray(need);
    } else {
      this.head = this.head.length === 0 ? chunk : Buffer.concat([this.head, chunk]);
    }
    this.drain();
  }

  /** Reads every complete frame in `head`; leaves a partial header or starts waiting for a body. */
  private drain(): void {
    for (;;) {
      if (this.skipping && !this.skipToHeader()) return;
      const end = this.head.indexOf(HEADER_END);
      const lfOnly = this.head.indexOf('\n\n', 0, 'latin1');
      if (lfOnly >= 0 && (end < 0 || lfOnly < end)) {
        this.startSkipping('the headers end with LF only (they end with CRLF CRLF)');
        continue;
      }
      if (end < 0) {
        if (this.head.length > MAX_HEADER_BYTES) this.startSkipping(`no end of headers within ${MAX_HEADER_BYTES} bytes`);
        else return;
        continue;
      }
      const header = parseHeader(this.head.toString('latin1', 0, end), this.maxFrame);
      if ('problem' in header) {
        this.startSkipping(header.problem);
        continue;
      }
      const rest = this.head.subarray(end + HEADER_END.length);
      if (rest.length >= header.length) {
        this.head = rest.subarray(header.length);
        this.deliver(rest.subarray(0, header.length));
        continue;
      }
      this.head = Buffer.alloc(0);
      this.parts = [rest];
      this.have = rest.length;
      this.need = header.length;
      return;
    }
  }

  private startSkipping(problem: string): void {
    this.log(`bad message frame: ${problem}; skipping to the next Content-Length header`);
    this.skipping = true;
    // The bad header starts at 0; the next frame can start one byte later at the earliest.
    this.head = this.head.subarray(1);
    this.skipped = 1;
  }

  /** Drops bytes up to the next `Content-Length:`; false when it is not in `head` yet (a tail that could start it is kept). */
  private skipToHeader(): boolean {
    const at = this.head.toString('latin1').toLowerCase().indexOf(LENGTH_NAME);
    if (at < 0) {
      const keep = Math.min(this.head.length, LENGTH_NAME.length - 1);
      this.skipped += this.head.length - keep;
      this.head = this.head.subarray(this.head.length - keep);
      return false;
    }
    this.skipped += at;
    this.head = this.head.subarray(at);
    this.skipping = false;
    this.log(`skipped ${this.skipped} bytes; reading frames again`);
    return true;
  }

  private deliver(body: Buffer): void {
    let message: unknown;
    try {
      message = JSON.parse(body.toString('utf8'));
    } catch (e) {
      // A body too short leaves the rest of the message in the stream: skip it to the next header.
      this.log(`bad message frame: the body of ${body.length} bytes is not JSON (${e instanceof Error ? e.message : String(e)})`);
      this.fireError(new Error('message body is not JSON'));
      this.skipping = true;
      this.skipped = 0;
      return;
    }
    this.callback?.(message as Message);
  }
}
