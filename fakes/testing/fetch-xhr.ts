/**
 * A minimal XMLHttpRequest built on fetch, enough for the upload SDK's browser client
 * (open, setRequestHeader, responseType "json", upload progress, load/error, abort),
 * so Node tests can drive the real client. The browser path itself is covered in Chromium.
 */
type Listener = (ev: { loaded: number; total?: number }) => void;

export class FetchXmlHttpRequest {
  status = 0;
  statusText = "";
  response: unknown = null;
  responseType = "";
  readyState = 0;
  private method = "GET";
  private url = "";
  private readonly headers = new Headers();
  private readonly ac = new AbortController();
  private readonly listeners: Record<string, Listener[]> = {};
  private readonly uploadListeners: Listener[] = [];

  readonly upload = {
    addEventListener: (type: string, fn: Listener) => {
      if (type === "progress") this.uploadListeners.push(fn);
    },
  };

  open(method: string, url: string): void {
    this.method = method;
    this.url = url;
    this.readyState = 1;
  }

  setRequestHeader(name: string, value: string): void {
    this.headers.set(name, value);
  }

  addEventListener(type: string, fn: Listener): void {
    (this.listeners[type] ??= []).push(fn);
  }

  private fire(type: string, ev: { loaded: number; total?: number } = { loaded: 0 }): void {
    for (const fn of this.listeners[type] ?? []) fn(ev);
  }

  send(body?: BodyInit | null): void {
    const size =
      body instanceof FormData
        ? [...body.values()].reduce((s, v) => s + (typeof v === "string" ? v.length : v.size), 0)
        : 0;
    fetch(this.url, {
      method: this.method,
      headers: this.headers,
      body: body ?? null,
      signal: this.ac.signal,
    })
      .then(async (r) => {
        for (const fn of this.uploadListeners) fn({ loaded: size, total: size });
        this.status = r.status;
        this.statusText = r.statusText;
        const text = await r.text();
        if (this.responseType === "json") {
          try {
            this.response = JSON.parse(text);
          } catch {
            this.response = null;
          }
        } else {
          this.response = text;
        }
        this.readyState = 4;
        this.fire("load");
      })
      .catch(() => {
        this.readyState = 4;
        if (!this.ac.signal.aborted) this.fire("error");
      });
  }

  abort(): void {
    this.ac.abort();
  }
}

/** Installs the stand-in as globalThis.XMLHttpRequest; returns a function that restores the previous value. */
export function installFetchXhr(): () => void {
  const g = globalThis as { XMLHttpRequest?: unknown };
  const before = g.XMLHttpRequest;
  g.XMLHttpRequest = FetchXmlHttpRequest;
  return () => {
    g.XMLHttpRequest = before;
  };
}
