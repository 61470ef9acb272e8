import { getNewRecordForm } from "@/lib/server/record-editor";
import { LoadError } from "../_components/load-error";
import { PageHeader } from "../_components/page-header";
import { FigureReader } from "./_components/figure-reader";

export const dynamic = "force-dynamic";
export const metadata = { title: "Records from a figure" };

export default async function FiguresPage({ searchParams }: { searchParams: Promise<{ sourceId?: string; document?: string; page?: string }> }) {
  const [{ sourceId, document, page }, result] = await Promise.all([searchParams, getNewRecordForm()]);
  if (!result.ok) return <LoadError error={result.error} what="the figure reader" />;
  const sources = result.data.sources.map((s) => ({ id: s.id, label: s.label }));
  const preselected = sources.find((s) => String(s.id) === sourceId)?.id ?? null;
  return (
    <>
      <PageHeader
        eyebrow="Records"
        title="Records from a figure"
        description="Read a process plot into records: calibrate the axes with two ticks each, place or find the markers, check them over the figure, then write them. Nothing is written before you choose Write records."
      />
      <FigureReader sources={sources} initialSourceId={preselected} initialDocumentId={Number(document) || null} initialPage={Number(page) || null} />
    </>
  );
}
