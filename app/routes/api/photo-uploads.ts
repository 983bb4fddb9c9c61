import { z } from "zod";
import type { Route } from "./+types/photo-uploads";
import { requireUser } from "~/auth/permissions.server";
import { jsonError } from "~/http/json.server";
import { photoKey, PhotoRefused, presignPhotoUpload, storageStatus } from "~/storage/s3.server";
import { PHOTO_SUBJECTS } from "~/visits/vocabulary";

const uploadRequest = z.object({
  contentType: z.string().max(100),
  contentLength: z.number().int().min(0).max(Number.MAX_SAFE_INTEGER),
  subject: z.enum(PHOTO_SUBJECTS),
});

/**
 * POST /api/photos/uploads {contentType, contentLength, subject} → {key, url, headers, expiresAt}:
 * a presigned PUT for one photo, under a key made here for this recorder. The photo itself never
 * passes through this server.
 */
export function loader({ request, context }: Route.LoaderArgs) {
  requireUser(request, context, { roles: ["recorder"] });
  return jsonError(405, "Use POST to ask for an upload URL.");
}

export async function action({ request, context }: Route.ActionArgs) {
  const user = requireUser(request, context, { roles: ["recorder"] });
  if (request.method !== "POST") return jsonError(405, "Use POST");
  const parsed = uploadRequest.safeParse(await request.json().catch(() => null));
  if (!parsed.success) return jsonError(400, "The upload request was not understood.", z.flattenError(parsed.error).fieldErrors as Record<string, string[]>);
  const status = await storageStatus();
  if (!status.ok) return jsonError(503, status.reason);
  try {
    const key = photoKey({ userId: user.id });
    const upload = await presignPhotoUpload({ key, contentType: parsed.data.contentType, contentLength: parsed.data.contentLength });
    return Response.json({ key, url: upload.url, headers: upload.headers, expiresAt: upload.expiresAt.toISOString() });
  } catch (error) {
    if (error instanceof PhotoRefused) return jsonError(400, error.reason, { photo: [error.reason] });
    throw error;
  }
}
