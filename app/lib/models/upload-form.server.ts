// Reading a multipart form with a few named files and text fields, each file within the
// upload limit. Shared by new versions and the spreadsheet import; answers with a
// Response (413, 415, 400) for a form it cannot read.
import { MaxFileSizeExceededError, parseFormData, type FileUpload } from "@mjackson/form-data-parser";
import { config } from "~/lib/config.server";
import { jsonError } from "~/lib/http.server";
import { tooLargeRefusal } from "./model-gate";

export interface UploadedFile {
  name: string;
  bytes: Uint8Array;
}

// room for the other fields and the multipart framing around the files
const FORM_OVERHEAD_BYTES = 64 * 1024;

export async function readUploadForm(
  request: Request,
  fileFields: readonly string[],
  describe: string,
): Promise<{ files: Map<string, UploadedFile>; form: FormData } | Response> {
  if (!/^multipart\/form-data/i.test(request.headers.get("content-type") ?? "")) {
    return jsonError(415, `Send ${describe} as multipart/form-data`);
  }
  const limit = config().UPLOAD_LIMIT_BYTES;
  const declared = Number(request.headers.get("content-length") ?? NaN);
  const tooLarge = () => {
    const r = tooLargeRefusal(null, null, limit);
    return jsonError(413, r.error, r.details);
  };
  if (Number.isFinite(declared) && declared > limit * fileFields.length + FORM_OVERHEAD_BYTES) return tooLarge();
  const files = new Map<string, UploadedFile>();
  try {
    const form = await parseFormData(request, { maxFileSize: limit, maxFiles: fileFields.length }, async (file: FileUpload) => {
      if (!fileFields.includes(file.fieldName)) return null;
      files.set(file.fieldName, { name: file.name || file.fieldName, bytes: new Uint8Array(await file.arrayBuffer()) });
      return null;
    });
    return { files, form };
  } catch (e) {
    if (e instanceof MaxFileSizeExceededError) return tooLarge();
    return jsonError(400, `The upload could not be read: ${(e as Error).message}`);
  }
}
