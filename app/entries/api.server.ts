import { z } from "zod";
import { apiJson } from "~/api/json.server";
import { FILE_KINDS } from "./sniff";

/** Shapes of the upload JSON API (/api/entries/:entryId/uploads, /api/uploads/…); refusals go out through apiCall. */
export const claimedFileSchema = z.object({
  kind: z.enum(FILE_KINDS),
  filename: z.string().trim().min(1, "The file needs a name.").max(200),
  size: z.number().int().min(0).max(Number.MAX_SAFE_INTEGER),
});

export const startUploadSchema = z.object({
  files: z.array(claimedFileSchema).min(1, "Choose the files to upload.").max(4),
  /** Sources by repository link and full commit hash instead of a bundle file. */
  repository: z.object({ url: z.string().max(2000), commit: z.string().max(200) }).nullish(),
  licence: z.string().max(500).nullish(),
});
export const uploadActionSchema = z.object({ action: z.enum(["complete", "abandon"]) });
export const fileActionSchema = z.discriminatedUnion("action", [
  z.object({ action: z.literal("sign"), partNumbers: z.array(z.number().int()).min(1).max(100) }),
  z.object({ action: z.literal("part"), partNumber: z.number().int().min(1).max(10_000), etag: z.string().min(1).max(200), size: z.number().int().min(0) }),
  z.object({ action: z.literal("confirm") }),
]);

export function okJson(body: unknown, status = 200): Response {
  return apiJson(body, { status });
}
