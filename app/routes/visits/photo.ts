import { data, redirect } from "react-router";
import type { Route } from "./+types/photo";
import { entityManagerContext } from "~/db/orm.server";
import { requireUser } from "~/auth/permissions.server";
import { Photo } from "~/entities";
import { canSeeVisit } from "~/visits/visits.server";
import { presignPhotoDownload } from "~/storage/s3.server";

/**
 * GET /photos/:photoId — checks that the viewer may see the visit, then sends the browser to a
 * presigned URL valid for five minutes. The photo bytes never pass through this server.
 */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = requireUser(request, context);
  const photo = await context.get(entityManagerContext).findOne(Photo, { id: Number(params.photoId) || 0 }, { populate: ["visit"] });
  if (!photo) throw data("No such photo.", { status: 404 });
  if (!canSeeVisit(user, { recorderId: photo.visit.recorder.id })) throw data("This photo is not yours to see.", { status: 403 });
  const url = await presignPhotoDownload(photo.storageKey, { contentType: photo.contentType as "image/jpeg" });
  return redirect(url, { headers: { "Cache-Control": "private, max-age=240" } });
}
