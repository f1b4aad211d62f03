import { apiNotFound, parseJsonBody, requireApiUser, requireMethod } from "~/api/json.server";
import { apiCall } from "~/errors/http.server";
import { claimedFileSchema, okJson } from "~/entries/api.server";
import { uploadForUploader } from "~/entries/upload-access.server";
import { putFile } from "~/entries/uploads.server";
import type { Route } from "./+types/api.uploads.$uploadId.files";

/** POST: add a file to a pending upload, or replace one that was refused (crew members). */
export async function action({ request, params, context }: Route.ActionArgs) {
  const user = await requireApiUser(context);
  requireMethod(request, ["POST"]);
  // who may upload is settled before the body is read
  if (!(await uploadForUploader(params.uploadId, user.id))) apiNotFound("That upload");
  const body = await parseJsonBody(request, claimedFileSchema);
  const out = await apiCall(() => putFile(params.uploadId, user.id, body));
  return okJson({ file: out.file }, 201);
}
