import { getDb } from "~/db/client.server";
import { uploadPhoto } from "~/models/media.server";
import { getStorage } from "~/services/storage.server";
import { readPhotoUpload } from "~/services/upload.server";
import { apiHandler } from "~/utils/http.server";
import { assertCan } from "~/utils/permissions";
import type { Route } from "./+types/api.media";
import { apiUser, methodNotAllowed, PRIVATE_JSON } from "./authoring-api.server";

export function loader() {
  return methodNotAllowed(["POST"], "Uploading a photo");
}

/**
 * Uploads one photo (multipart field `file`): 201 `{ id, width, height, variants: [{ width, format, url }] }`.
 * The permission is checked before a byte of the body is read; 413 past 25 MB or 40 megapixels,
 * 415 for a file that is not JPEG, PNG, WebP or HEIC by its own bytes, 400 with `fields.file` when
 * no photo came.
 */
export const action = apiHandler(async (args: Route.ActionArgs) => {
  if (args.request.method !== "POST") return loader();
  const user = await apiUser(args);
  assertCan(user, "upload:media");
  const { file, filename } = await readPhotoUpload(args.request);
  const photo = await uploadPhoto(await getDb(), getStorage(), user, file, filename);
  return Response.json(photo, { status: 201, headers: PRIVATE_JSON });
});
