import Link from "next/link";
import { notFound } from "next/navigation";
import { getRecordEditor } from "@/lib/server/record-editor";
import { Alert } from "../../../_components/alert";
import { LoadError } from "../../../_components/load-error";
import { PageHeader } from "../../../_components/page-header";
import { statusLabel } from "../../../_components/status-badge";
import { RecordForm } from "../../_components/record-form";
import { recordFormValuesOf } from "../../_lib/record-form-values";
import { updateRecordAction } from "../../actions";

export const dynamic = "force-dynamic";

type Props = { params: Promise<{ id: string }> };

export async function generateMetadata({ params }: Props) {
  const { id } = await params;
  return { title: `Edit record ${id}` };
}

export default async function EditRecordPage({ params }: Props) {
  const { id } = await params;
  const result = await getRecordEditor(Number(id));
  if (!result.ok) {
    if (result.error.code === "not_found") notFound();
    return <LoadError error={result.error} what={`record ${id}`} />;
  }
  const { record, sources } = result.data;
  const header = <PageHeader eyebrow={<Link href={`/records/${record.id}`}>Record {record.id}</Link>} title={`Edit record ${record.id}`} description={`Version ${record.version} · ${statusLabel(record.status)}${record.status === "accepted" ? " — saving an edit sends it back for review" : ""}`} />;
  if (record.status === "rejected" || record.status === "merged") {
    return (
      <>
        {header}
        <Alert tone="warning" title={`This record is ${statusLabel(record.status).toLowerCase()}`}>
          <p>
            A {record.status} record is kept for the history and can no longer be edited. <Link href={`/records/${record.id}`}>Back to the record</Link>
          </p>
        </Alert>
      </>
    );
  }
  return (
    <>
      {header}
      <RecordForm mode="edit" initial={recordFormValuesOf(record)} sources={sources} recordId={record.id} version={record.version} action={updateRecordAction} />
    </>
  );
}
