import { spawn, execFileSync } from "node:child_process";
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { createServer, type Server } from "node:http";
import { tmpdir } from "node:os";
import { dirname, join } from "node:path";

/**
 * Bare repositories served over git's smart HTTP protocol on loopback, for tests: a tiny HTTP server hands each
 * request to git's own CGI program, `git http-backend` (git 2.39 from Debian), as the git-http-backend manual
 * describes (GIT_PROJECT_ROOT, GIT_HTTP_EXPORT_ALL, PATH_INFO, the Git-Protocol header as GIT_PROTOCOL).
 */
export interface GitServer {
  root: string;
  url(repo: string): string;
  /** Requests seen, as "METHOD path" (to show what a fetch asked for). */
  requests: string[];
  close(): Promise<void>;
}

export async function startGitServer(opts: { redirectTo?: string; stall?: boolean } = {}): Promise<GitServer> {
  const root = mkdtempSync(join(tmpdir(), "gc-git-served-"));
  const requests: string[] = [];
  const server: Server = createServer((req, res) => {
    const url = new URL(req.url ?? "/", "http://127.0.0.1");
    requests.push(`${req.method} ${url.pathname}`);
    if (opts.stall) return; // a host that accepts the connection and never answers
    if (opts.redirectTo && url.pathname.startsWith("/moved/")) {
      res.writeHead(301, { location: `${opts.redirectTo}${url.pathname.slice("/moved".length)}${url.search}` }).end();
      return;
    }
    const cgi = spawn("git", ["http-backend"], {
      env: {
        PATH: "/usr/bin:/bin",
        GIT_PROJECT_ROOT: root,
        GIT_HTTP_EXPORT_ALL: "1",
        PATH_INFO: decodeURIComponent(url.pathname),
        QUERY_STRING: url.search.slice(1),
        REQUEST_METHOD: req.method ?? "GET",
        CONTENT_TYPE: req.headers["content-type"] ?? "",
        CONTENT_LENGTH: req.headers["content-length"] ?? "",
        HTTP_CONTENT_ENCODING: req.headers["content-encoding"] ?? "",
        GIT_PROTOCOL: String(req.headers["git-protocol"] ?? ""),
        REMOTE_ADDR: "127.0.0.1",
        REMOTE_USER: "",
      },
    });
    req.pipe(cgi.stdin);
    let head = Buffer.alloc(0);
    let started = false;
    cgi.stdout.on("data", (chunk: Buffer) => {
      if (started) {
        res.write(chunk);
        return;
      }
      head = Buffer.concat([head, chunk]);
      const end = head.indexOf("\r\n\r\n");
      if (end < 0) return;
      started = true;
      let status = 200;
      const headers: Record<string, string> = {};
      for (const line of head.subarray(0, end).toString("latin1").split("\r\n")) {
        const i = line.indexOf(":");
        const name = line.slice(0, i).trim().toLowerCase();
        const value = line.slice(i + 1).trim();
        if (name === "status") status = Number(value.split(" ")[0]);
        else headers[name] = value;
      }
      res.writeHead(status, headers);
      res.write(head.subarray(end + 4));
    });
    cgi.stdout.on("end", () => res.end());
    cgi.on("error", () => res.destroy());
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const port = (server.address() as { port: number }).port;
  return {
    root,
    requests,
    url: (repo) => `http://127.0.0.1:${port}/${repo}`,
    close: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => {
          rmSync(root, { recursive: true, force: true });
          resolve();
        });
      }),
  };
}

/** A working folder committed into a bare repository under the server's root; returns the commit hash. */
export function commitTree(
  server: GitServer,
  repo: string,
  files: Record<string, string | Buffer>,
  extra: (work: string, git: (...args: string[]) => string) => void = () => {},
  opts: { history?: Record<string, string | Buffer>[] } = {},
): string {
  const work = mkdtempSync(join(tmpdir(), "gc-git-work-"));
  const git = (...args: string[]) =>
    execFileSync("git", ["-c", "user.name=Test Crew", "-c", "user.email=crew@example.test", "-c", "init.defaultBranch=main", "-c", "protocol.file.allow=always", ...args], { cwd: work, encoding: "utf8" }).trim();
  try {
    git("init", "-q");
    const write = (set: Record<string, string | Buffer>) => {
      for (const [name, body] of Object.entries(set)) {
        mkdirSync(dirname(join(work, name)), { recursive: true });
        writeFileSync(join(work, name), body);
      }
    };
    write(files);
    git("add", "-A");
    // After the add: it may stage what `add -A` would drop again (a gitlink without its folder).
    extra(work, git);
    git("commit", "-q", "-m", "entry");
    const commit = git("rev-parse", "HEAD");
    // Later commits on top, so the one asked for is not the newest.
    for (const [i, set] of (opts.history ?? []).entries()) {
      write(set);
      git("add", "-A");
      git("commit", "-q", "-m", `later ${i + 1}`);
    }
    const bare = join(server.root, repo);
    execFileSync("git", ["clone", "-q", "--bare", work, bare]);
    return commit;
  } finally {
    rmSync(work, { recursive: true, force: true });
  }
}
