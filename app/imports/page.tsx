import { getNewRecordForm } from "@/lib/server/record-editor";
import { LoadError } from "../_components/load-error";
import { PageHeader } from "../_components/page-header";
import { ImportFlow } from "./_components/import-flow";

export const dynamic = "force-dynamic";
export const metadata = { title: "Import a table" };

export default async function ImportPage({ searchParams }: { searchParams: Promise<{ sourceId?: string }> }) {
  const [{ sourceId }, result] = await Promise.all([searchParams, getNewRecordForm()]);
  if (!result.ok) return <LoadError error={result.error} what="the import page" />;
  const { sources } = result.data;
  const preselected = sources.find((s) => String(s.id) === sourceId)?.id ?? null;
  return (
    <>
      <PageHeader eyebrow="Records" title="Import a table" description="A spreadsheet, a table pasted from a paper, or one boxed in its PDF: map the columns, check every row, then import all of them or none." />
      <ImportFlow sources={sources} initialSourceId={preselected} />
    </>
  );
}
