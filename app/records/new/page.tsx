import { getNewRecordForm } from "@/lib/server/record-editor";
import { LoadError } from "../../_components/load-error";
import { PageHeader } from "../../_components/page-header";
import { RecordFormWithPdf } from "../_components/record-form-with-pdf";
import { emptyRecordFormValues } from "../_lib/record-form-values";
import { createRecordAction } from "../actions";

export const dynamic = "force-dynamic";
export const metadata = { title: "Key in a record" };

export default async function NewRecordPage({ searchParams }: { searchParams: Promise<{ sourceId?: string }> }) {
  const [{ sourceId }, result] = await Promise.all([searchParams, getNewRecordForm()]);
  if (!result.ok) return <LoadError error={result.error} what="the record form" />;
  const { sources } = result.data;
  const preselected = sources.find((s) => String(s.id) === sourceId)?.id ?? null;
  return (
    <>
      <PageHeader eyebrow="Records" title="Key in a record" description="Type values with the units the source uses; they are stored in one canonical unit per quantity, and what you typed is kept beside them." />
      <RecordFormWithPdf sourceId={preselected} mode="create" initial={emptyRecordFormValues(preselected)} sources={sources} action={createRecordAction} autoFocusFirst />
    </>
  );
}
