import type { AppError } from "@/lib/server/result";
import { uploadLimitBytes } from "@/lib/server/files";

/**
 * Reads the file of a multipart upload (field "file"). A body that is not multipart, one larger
 * than the upload limit (by its Content-Length, before reading), or one without a file comes back
 * as a typed error; the storage layer checks size and content again while streaming.
 */
export async function readUpload(request: Request): Promise<{ ok: true; file: File } | { ok: false; error: AppError }> {
  const type = request.headers.get("content-type") ?? "";
  if (!/^multipart\/form-data\b/i.test(type)) return { ok: false, error: { code: "unsupported_type", message: "Send the file as multipart/form-data with the field \"file\"." } };
  const limit = uploadLimitBytes();
  const length = Number(request.headers.get("content-length") ?? "0");
  // multipart framing adds a few hundred bytes; 64 KiB of slack is ample
  if (length > limit + 65_536) return { ok: false, error: { code: "too_large", message: `The upload is larger than the limit of ${(limit / 1024 / 1024).toLocaleString("en")} MB (MELTLEDGER_UPLOAD_LIMIT_MB); nothing was stored.` } };
  let form: FormData;
  try {
    form = await request.formData();
  } catch {
    return { ok: false, error: { code: "invalid_input", message: "The upload could not be read as a form." } };
  }
  const file = form.get("file");
  if (!(file instanceof File)) return { ok: false, error: { code: "invalid_input", message: "Choose a file to upload.", details: { fieldErrors: { file: ["Choose a file to upload."] } } } };
  return { ok: true, file };
}
