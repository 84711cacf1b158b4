/**
 * The protocol's lifecycle (LSP 3.17, "Server lifecycle"), enforced in front of the connection: before
 * `initialize` a request gets ServerNotInitialized (-32002) and a notification is dropped (except
 * `exit`); a second `initialize` and every request after `shutdown` (a second `shutdown` too) get
 * InvalidRequest (-32600), and notifications after `shutdown` other than `exit` are dropped. Refused
 * requests are answered here and never reach the handlers.
 */
import {
  AbstractMessageReader,
  Disposable,
  ErrorCodes,
  Message,
  type DataCallback,
  type MessageReader,
  type MessageWriter,
  type RequestMessage,
  type ResponseMessage,
} from 'vscode-languageserver/node';

/** Where the session is in its lifecycle. */
export type Phase = 'new' | 'running' | 'shutdown';

/** A MessageReader that passes on only what the lifecycle allows. */
export class LifecycleGate extends AbstractMessageReader {
  phase: Phase = 'new';

  constructor(
    private readonly inner: MessageReader,
    private readonly writer: MessageWriter,
    private readonly log: (message: string) => void,
  ) {
    super();
  }

  listen(callback: DataCallback): Disposable {
    const subs = [this.inner.onError((e) => this.fireError(e)), this.inner.onClose(() => this.fireClose()), this.inner.onPartialMessage((i) => this.firePartialMessage(i))];
    const reading = this.inner.listen((m) => {
      if (this.admit(m)) callback(m);
    });
    return Disposable.create(() => {
      for (const s of subs) s.dispose();
      reading.dispose();
    });
  }

  /** True when `m` may go on to the connection; refused requests are answered. */
  private admit(m: Message): boolean {
    if (Message.isRequest(m)) {
      if (this.phase === 'new' && m.method !== 'initialize') return this.refuse(m, ErrorCodes.ServerNotInitialized, `${m.method} before initialize`);
      if (this.phase === 'running' && m.method === 'initialize') return this.refuse(m, ErrorCodes.InvalidRequest, 'initialize was already received');
      if (this.phase === 'shutdown') return this.refuse(m, ErrorCodes.InvalidRequest, `${m.method} after shutdown`);
      if (m.method === 'initialize') this.phase = 'running';
      else if (m.method === 'shutdown') this.phase = 'shutdown';
      return true;
    }
    if (Message.isNotification(m) && m.method !== 'exit' && this.phase !== 'running') {
      this.log(`dropped notification ${m.method} ${this.phase === 'new' ? 'before initialize' : 'after shutdown'}`);
      return false;
    }
    return true;
  }

  private refuse(m: RequestMessage, code: number, message: string): false {
    this.log(`refused request ${m.method}: ${message}`);
    const response: ResponseMessage = { jsonrpc: '2.0', id: m.id, error: { code, message } };
    this.writer.write(response).catch((e: unknown) => this.log(`answering ${m.method} failed: ${String(e)}`));
    return false;
  }
}
