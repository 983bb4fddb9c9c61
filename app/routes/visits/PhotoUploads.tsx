import { useRef } from "react";
import { BEE_VIEW_LABELS, BEE_VIEWS, type BeeView, type PhotoSubject } from "~/visits/vocabulary";

export interface PhotoDraft {
  localId: string;
  subject: PhotoSubject;
  fileName: string;
  previewUrl: string;
  /** 0–1 while uploading. */
  progress: number;
  state: "uploading" | "uploaded" | "failed";
  key?: string;
  error?: string;
  views: BeeView[];
  exif?: { takenAt: string | null; latitude: number | null; longitude: number | null };
}

export const MAX_PHOTO_BYTES = 20 * 1024 * 1024;

/**
 * Uploads a photo straight to object storage: asks our server for a presigned PUT, then sends the
 * file with XMLHttpRequest (fetch cannot report upload progress). The app server never holds it.
 */
export async function uploadPhoto(file: File, subject: PhotoSubject, onProgress: (fraction: number) => void): Promise<string> {
  const contentType = file.type || "application/octet-stream";
  const ticket = await fetch("/api/photos/uploads", {
    method: "POST",
    headers: { "Content-Type": "application/json" },
    body: JSON.stringify({ contentType, contentLength: file.size, subject }),
  });
  const body = await ticket.json().catch(() => ({}));
  if (!ticket.ok) throw new Error(body.error ?? "Photo storage is not reachable right now; try again in a moment.");
  await new Promise<void>((resolve, reject) => {
    const request = new XMLHttpRequest();
    request.open("PUT", body.url);
    for (const [header, value] of Object.entries(body.headers as Record<string, string>)) request.setRequestHeader(header, value);
    request.upload.onprogress = (event) => event.lengthComputable && onProgress(event.loaded / event.total);
    request.onload = () => (request.status < 300 ? resolve() : reject(new Error(`The upload was refused (${request.status}); try again.`)));
    request.onerror = () => reject(new Error("The upload was interrupted; check the connection and try again."));
    request.send(file);
  });
  onProgress(1);
  return body.key as string;
}

export function PhotoPicker({
  subject,
  label,
  onFiles,
}: {
  subject: PhotoSubject;
  label: string;
  onFiles: (files: File[], subject: PhotoSubject) => void;
}) {
  const input = useRef<HTMLInputElement>(null);
  return (
    <label className="flex min-h-12 flex-1 cursor-pointer items-center justify-center gap-2 rounded-md border-2 border-dashed border-moss/60 bg-white/70 px-3 text-center font-semibold text-moss-deep has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-pollen">
      <span aria-hidden="true" className="text-xl leading-none">+</span> {label}
      <input
        ref={input}
        type="file"
        accept="image/jpeg,image/png,image/webp,image/heic,image/heif"
        // On phones this opens the camera directly.
        capture="environment"
        multiple
        className="sr-only"
        data-subject={subject}
        onChange={(event) => {
          const files = [...(event.target.files ?? [])];
          if (files.length) onFiles(files, subject);
          event.target.value = "";
        }}
      />
    </label>
  );
}

export function PhotoList({
  photos,
  onViews,
  onRemove,
  onUseExif,
}: {
  photos: PhotoDraft[];
  onViews: (localId: string, views: BeeView[]) => void;
  onRemove: (localId: string) => void;
  onUseExif: (photo: PhotoDraft) => void;
}) {
  if (photos.length === 0) return null;
  return (
    <ul className="space-y-3" aria-label="Photos of this visit">
      {photos.map((photo) => (
        <li key={photo.localId} className="flex gap-3 rounded-md border border-ink/10 bg-white/70 p-2" data-testid="photo-draft">
          <img src={photo.previewUrl} alt={`${photo.subject === "bee" ? "Bee" : "Plant"} photo ${photo.fileName}`} className="h-20 w-20 flex-none rounded object-cover" />
          <div className="min-w-0 flex-1 space-y-1 text-sm">
            <p className="flex items-center justify-between gap-2">
              <span className="truncate font-semibold">{photo.subject === "bee" ? "Bee" : "Plant"}</span>
              <button type="button" onClick={() => onRemove(photo.localId)} className="min-h-11 rounded px-2 text-clay underline">
                Remove
              </button>
            </p>
            <div
              role="progressbar"
              aria-label={`Upload of ${photo.fileName}`}
              aria-valuemin={0}
              aria-valuemax={100}
              aria-valuenow={Math.round(photo.progress * 100)}
              className="h-2 overflow-hidden rounded bg-ink/10"
            >
              <div className={`h-full ${photo.state === "failed" ? "bg-clay" : "bg-moss"}`} style={{ width: `${Math.round(photo.progress * 100)}%` }} />
            </div>
            <p className={photo.state === "failed" ? "font-medium text-clay" : "text-ink-soft"} role={photo.state === "failed" ? "alert" : undefined}>
              {photo.state === "uploading" ? `Uploading… ${Math.round(photo.progress * 100)} %` : photo.state === "uploaded" ? "Uploaded" : photo.error}
            </p>
            {photo.exif && (photo.exif.takenAt || photo.exif.latitude !== null) && (
              <button type="button" onClick={() => onUseExif(photo)} className="min-h-11 rounded-md border border-sky px-3 font-medium text-sky">
                Use this photo’s {[photo.exif.takenAt && "time", photo.exif.latitude !== null && "place"].filter(Boolean).join(" and ")}
              </button>
            )}
            {photo.subject === "bee" && (
              <fieldset>
                <legend className="text-ink-soft">It shows</legend>
                <div className="flex flex-wrap gap-1">
                  {BEE_VIEWS.map((view) => (
                    <label key={view} className="inline-flex min-h-11 items-center gap-1.5 rounded border border-ink/15 px-2">
                      <input
                        type="checkbox"
                        className="h-5 w-5 accent-moss"
                        checked={photo.views.includes(view)}
                        onChange={(event) =>
                          onViews(photo.localId, event.target.checked ? [...photo.views, view] : photo.views.filter((v) => v !== view))
                        }
                      />
                      {BEE_VIEW_LABELS[view]}
                    </label>
                  ))}
                </div>
              </fieldset>
            )}
          </div>
        </li>
      ))}
    </ul>
  );
}
