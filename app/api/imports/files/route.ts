import { NextResponse } from "next/server";
import { storeImportFile } from "@/lib/server/files";
import { requestActor } from "../../../_lib/actor";
import { errorResponse } from "../../_lib/json";
import { readUpload } from "../../_lib/upload";

export const dynamic = "force-dynamic";

/** POST /api/imports/files with a multipart "file" (.csv or .xlsx): stores it and returns its reference. */
export async function POST(request: Request) {
  const actor = await requestActor(request);
  if (!actor.ok) return errorResponse(actor.error);
  const upload = await readUpload(request);
  if (!upload.ok) return errorResponse(upload.error);
  const name = upload.file.name;
  const format = /\.xlsx$/i.test(name) ? "xlsx" : /\.(csv|tsv|txt)$/i.test(name) ? "csv" : null;
  if (!format) return errorResponse({ code: "unsupported_type", message: `"${name}" is neither .csv nor .xlsx. Save the sheet as one of those (a legacy .xls as .xlsx).` });
  const result = await storeImportFile(upload.file.stream(), format, name, actor.data);
  if (!result.ok) return errorResponse(result.error);
  return NextResponse.json({ sha256: result.data.sha256, fileName: result.data.fileName, format, sizeBytes: result.data.sizeBytes }, { status: 201 });
}
