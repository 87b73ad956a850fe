// The upload gate where it costs the web server nothing: small files (the usual hand-written
// model) are checked at once, larger ones on the web pool's thread, so a 30,000-member lattice
// does not hold up every other request while it is parsed and validated.
import { checkModelOnThread } from "~/lib/web-pool.server";
import { checkModelBytes, type GateResult } from "./model-gate";

/** Files up to this size are checked on the request thread (well under 10 ms). */
export const INLINE_CHECK_BYTES = 128 * 1024;

export function checkModelUpload(fileName: string, bytes: Uint8Array, limitBytes: number): Promise<GateResult> {
  if (bytes.byteLength <= INLINE_CHECK_BYTES || bytes.byteLength > limitBytes) return Promise.resolve(checkModelBytes(fileName, bytes, limitBytes));
  return checkModelOnThread({ fileName, bytes, limitBytes });
}
