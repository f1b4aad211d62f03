import type { NextFunction, Request, Response } from "express";
import { bodyLimitFor, tooLargeMessage } from "~/security/body-limits";

/**
 * Request bodies over their route's limit (app/security/body-limits.ts) are refused before the app holds them: a
 * declared Content-Length over the limit at once, a body without one as soon as the bytes counted while it streams
 * pass the limit. The answer is 413 with `Connection: close`, so the rest of the upload is not read.
 */
export function bodyLimit(req: Request, res: Response, next: NextFunction): void {
  if (req.method === "GET" || req.method === "HEAD") return next();
  const limit = bodyLimitFor(req.path);
  const declared = Number(req.headers["content-length"] ?? "");
  if (Number.isFinite(declared) && declared > limit) return refuse(req, res, limit);
  let seen = 0;
  const count = (chunk: Buffer) => {
    seen += chunk.length;
    if (seen > limit) {
      req.off("data", count);
      refuse(req, res, limit);
    }
  };
  req.on("data", count);
  next();
}

function refuse(req: Request, res: Response, limit: number): void {
  if (res.headersSent) {
    req.socket.destroy();
    return;
  }
  const message = tooLargeMessage(limit);
  res.status(413).set("Connection", "close");
  if (req.path.startsWith("/api/")) res.json({ error: { status: 413, code: "body_too_large", message } });
  else res.type("text/plain").send(message);
}
