import type { PhotoInspector } from "../visits/visits.server.ts";
import { checkPhoto } from "./s3.server.ts";

/** The visit code's view of photo storage: a check per uploaded key. */
export function photoInspector(): PhotoInspector {
  return {
    async check(key) {
      const result = await checkPhoto(key);
      return result.ok ? { ok: true, size: result.size, contentType: result.contentType } : { ok: false, reason: result.reason };
    },
  };
}
