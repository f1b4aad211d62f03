// Small node:http helpers: bounded body reading and the three kinds of replies the fake sends.
import type { IncomingMessage, ServerResponse } from "node:http";
import { ApiError } from "./errors";

const MAX_BODY_BYTES = 256 * 1024;

export async function readBody(request: IncomingMessage): Promise<string> {
  const chunks: Buffer[] = [];
  let size = 0;
  for await (const chunk of request) {
    size += (chunk as Buffer).length;
    if (size > MAX_BODY_BYTES) {
      throw new ApiError(413, "invalid_request_error", `Request body is larger than ${MAX_BODY_BYTES} bytes.`);
    }
    chunks.push(chunk as Buffer);
  }
  return Buffer.concat(chunks).toString("utf8");
}

export function sendJson(response: ServerResponse, status: number, body: string, headers: Record<string, string> = {}): void {
  response.writeHead(status, {
    "Content-Type": "application/json; charset=utf-8",
    "Content-Length": Buffer.byteLength(body),
    "Cache-Control": "no-store",
    ...headers,
  });
  response.end(body);
}

export function sendHtml(response: ServerResponse, status: number, html: string): void {
  response.writeHead(status, {
    "Content-Type": "text/html; charset=utf-8",
    "Content-Length": Buffer.byteLength(html),
    "Cache-Control": "no-store",
    // The page needs no script and loads nothing from elsewhere.
    "Content-Security-Policy": "default-src 'none'; style-src 'unsafe-inline'; form-action *",
  });
  response.end(html);
}

export function redirectSeeOther(response: ServerResponse, location: string): void {
  response.writeHead(303, { Location: location, "Content-Length": 0, "Cache-Control": "no-store" });
  response.end();
}

export function isFormContentType(request: IncomingMessage): boolean {
  const type = (request.headers["content-type"] ?? "").split(";")[0].trim().toLowerCase();
  return type === "" || type === "application/x-www-form-urlencoded";
}
