import { chmodSync } from "node:fs";
import { createServer, request as httpRequest, type IncomingMessage, type ServerResponse } from "node:http";
import { lookup } from "node:dns/promises";
import { connect, type Socket } from "node:net";
import { hostKind } from "./repository-link";

/**
 * The repository fetch's only way out of its sandbox: an HTTP proxy on a Unix socket that serves exactly one
 * destination. It answers CONNECT (https) and absolute-form requests (http) for the link's host:port and nothing
 * else, connects to the addresses it resolved and checked before the fetch (so a DNS answer cannot change to an
 * inside address half-way), and cuts the transfer at the byte budget.
 */
export class FetchHostError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "FetchHostError";
  }
}

/** Resolves the host once and refuses it when any address is not public (loopback only when allowed). */
export async function resolveFetchHost(host: string, allowLoopback: boolean): Promise<string[]> {
  const kind = hostKind(host);
  let addresses: string[];
  if (kind === "name") {
    const found = await lookup(host, { all: true }).catch((e: NodeJS.ErrnoException) => {
      if (e.code === "ENOTFOUND" || e.code === "EAI_AGAIN" || e.code === "ENODATA") throw new FetchHostError(`the host ${host} could not be found (${e.code})`);
      throw e;
    });
    addresses = found.map((a) => a.address);
  } else {
    addresses = [host === "localhost" || host.endsWith(".localhost") ? "127.0.0.1" : host];
  }
  for (const a of addresses) {
    const k = hostKind(a);
    if (k === "public" || (k === "loopback" && allowLoopback)) continue;
    throw new FetchHostError(`the host ${host} resolves to ${a}, which is ${k === "loopback" ? "the checking machine itself" : "inside a private network"}; only public hosts are fetched from`);
  }
  if (addresses.length === 0) throw new FetchHostError(`the host ${host} has no address`);
  return addresses;
}

export interface FetchProxyOptions {
  socketPath: string;
  host: string;
  port: number;
  addresses: string[];
  budgetBytes: number;
}

export interface FetchProxy {
  /** Bytes received from the repository host so far. */
  received(): number;
  overBudget(): boolean;
  /** Destinations asked for and refused (a redirect or a submodule elsewhere). */
  refused(): string[];
  close(): Promise<void>;
}

export async function startFetchProxy(opts: FetchProxyOptions): Promise<FetchProxy> {
  let received = 0;
  let over = false;
  const refused: string[] = [];
  const open = new Set<Socket>();
  const target = `${opts.host}:${opts.port}`;
  const address = opts.addresses[0];

  const count = (n: number, cut: () => void) => {
    received += n;
    if (received > opts.budgetBytes && !over) {
      over = true;
      cut();
    }
  };

  const server = createServer((req: IncomingMessage, res: ServerResponse) => {
    let url: URL;
    try {
      url = new URL(req.url ?? "");
    } catch (e) {
      if (!(e instanceof TypeError)) throw e;
      res.writeHead(400).end();
      return;
    }
    const port = url.port ? Number(url.port) : 80;
    if (url.protocol !== "http:" || `${url.hostname.toLowerCase()}:${port}` !== target) {
      refused.push(`${url.protocol}//${url.host}`);
      res.writeHead(403, { "content-type": "text/plain" }).end("Gatecrash fetches only from the entry's repository host\n");
      return;
    }
    const headers: Record<string, string | string[] | undefined> = { ...req.headers, host: url.host };
    delete headers["proxy-connection"];
    delete headers["proxy-authorization"];
    const upstream = httpRequest({ host: address, port, method: req.method, path: `${url.pathname}${url.search}`, headers }, (up) => {
      res.writeHead(up.statusCode ?? 502, up.headers);
      up.on("data", (chunk: Buffer) => count(chunk.length, () => {
        up.destroy();
        res.destroy();
      }));
      up.pipe(res);
    });
    upstream.on("error", () => res.destroy());
    req.pipe(upstream);
  });

  server.on("connect", (req: IncomingMessage, client: Socket, head: Buffer) => {
    open.add(client);
    client.on("close", () => open.delete(client));
    client.on("error", () => client.destroy());
    if ((req.url ?? "").toLowerCase() !== target) {
      refused.push(req.url ?? "");
      client.end("HTTP/1.1 403 Forbidden\r\n\r\n");
      return;
    }
    const upstream = connect({ host: address, port: opts.port }, () => {
      client.write("HTTP/1.1 200 Connection Established\r\n\r\n");
      if (head.length) upstream.write(head);
      client.pipe(upstream);
      upstream.pipe(client);
    });
    open.add(upstream);
    upstream.on("close", () => open.delete(upstream));
    upstream.on("data", (chunk: Buffer) => count(chunk.length, () => {
      upstream.destroy();
      client.destroy();
    }));
    upstream.on("error", () => client.destroy());
    client.on("close", () => upstream.destroy());
  });
  server.on("connection", (s: Socket) => {
    open.add(s);
    s.on("close", () => open.delete(s));
  });

  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(opts.socketPath, () => resolve());
  });
  // The sandbox user must be able to connect; the socket sits in that run's own build folder.
  chmodSync(opts.socketPath, 0o666);

  return {
    received: () => received,
    overBudget: () => over,
    refused: () => [...refused],
    close: () =>
      new Promise<void>((resolve) => {
        for (const s of open) s.destroy();
        server.close(() => resolve());
      }),
  };
}
