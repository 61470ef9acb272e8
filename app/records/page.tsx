import { getRecordsBrowser } from "@/lib/server/records-facets";
import { LoadError } from "../_components/load-error";
import { PageHeader } from "../_components/page-header";
import { RecordsTable } from "./_components/records-table";
import { queryInputFromTableState, queryStringOf, tableStateFromParams, toURLSearchParams } from "./_lib/records-url";

export const dynamic = "force-dynamic";
export const metadata = { title: "Records" };

export default async function RecordsPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const state = tableStateFromParams(toURLSearchParams(await searchParams));
  const result = await getRecordsBrowser(queryInputFromTableState(state));
  if (!result.ok) return <LoadError error={result.error} what="the records" />;
  const { facets, page, queryError } = result.data;
  return (
    <>
      <PageHeader title="Records" description="Every value in its canonical unit. Filter, sort and choose columns; the address bar keeps the view, so it can be shared or bookmarked." />
      <RecordsTable
        facets={facets}
        initialKey={queryStringOf(state)}
        initialPage={page ? { rows: page.rows, total: page.total, page: page.query.page, pageSize: page.query.pageSize } : null}
        initialError={queryError}
      />
    </>
  );
}
