import { data } from "react-router";
import { bodyLimitFor, tooLargeMessage } from "~/security/body-limits";
import { apiError } from "./json.server";

/**
 * Reading request bodies without trusting them: the declared Content-Length is checked first, then the bytes are
 * counted as they stream in, and reading stops at the limit (the stream is left unread rather than cancelled, so
 * the connection survives to carry the 413). Pages get a thrown data() response, JSON routes the API error shape.
 */
export class BodyError extends Error {
  constructor(
    readonly status: 400 | 413 | 415,
    readonly code: string,
    message: string,
  ) {
    super(message);
    this.name = "BodyError";
  }
}

export async function readBodyLimited(request: Request, maxBytes: number): Promise<Uint8Array<ArrayBuffer>> {
  const declared = Number(request.headers.get("content-length") ?? "");
  if (Number.isFinite(declared) && declared > maxBytes) throw new BodyError(413, "body_too_large", tooLargeMessage(maxBytes));
  if (!request.body) return new Uint8Array(new ArrayBuffer(0));
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  try {
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      total += value.byteLength;
      if (total > maxBytes) throw new BodyError(413, "body_too_large", tooLargeMessage(maxBytes));
      chunks.push(value);
    }
  } finally {
    reader.releaseLock();
  }
  const out = new Uint8Array(new ArrayBuffer(total));
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.byteLength;
  }
  return out;
}

const FORM_TYPES = ["application/x-www-form-urlencoded", "multipart/form-data"];

/** A page action's form, within the route's limit; no form type is a 415, a broken multipart body a 400. */
export async function readForm(request: Request, maxBytes = bodyLimitFor(new URL(request.url).pathname)): Promise<FormData> {
  try {
    const type = request.headers.get("content-type") ?? "";
    if (!FORM_TYPES.some((t) => type.toLowerCase().startsWith(t))) throw new BodyError(415, "unsupported_media_type", "Pages accept form submissions only.");
    const bytes = await readBodyLimited(request, maxBytes);
    try {
      return await new Response(bytes, { headers: { "content-type": type } }).formData();
    } catch (e) {
      if (e instanceof TypeError) throw new BodyError(400, "invalid_form", "The form could not be read. Reload the page and send it again.");
      throw e;
    }
  } catch (e) {
    if (e instanceof BodyError) throw data({ message: e.message }, { status: e.status, headers: e.status === 413 ? { Connection: "close" } : undefined });
    throw e;
  }
}

/** A JSON route's body as text, within the route's limit, in the API error shape. */
export async function readJsonText(request: Request, maxBytes = bodyLimitFor(new URL(request.url).pathname)): Promise<string> {
  try {
    return new TextDecoder().decode(await readBodyLimited(request, maxBytes));
  } catch (e) {
    if (e instanceof BodyError) {
      const res = apiError(e.status, e.code, e.message);
      if (e.status === 413) res.headers.set("Connection", "close");
      throw res;
    }
    throw e;
  }
}
