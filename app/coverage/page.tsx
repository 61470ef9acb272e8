import { getCoveragePage } from "@/lib/server/coverage";
import { LoadError } from "../_components/load-error";
import { PageHeader } from "../_components/page-header";
import { CoverageView } from "./_components/coverage-view";
import { filtersFromParams, queryInputOf } from "./_lib/coverage-url";
import "./coverage.css";

export const dynamic = "force-dynamic";
export const metadata = { title: "Coverage" };

export default async function CoveragePage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const filters = filtersFromParams(await searchParams);
  const result = await getCoveragePage(queryInputOf(filters));
  if (!result.ok) return <LoadError error={result.error} what="the coverage view" />;
  return (
    <>
      <PageHeader
        title="Coverage"
        description="Where the collection is thin on the power–speed plane, judged against the process window the melt-pool criteria predict, and the experiments that would fill it."
      />
      <CoverageView alloys={result.data.alloys} initialFilters={filters} initialReport={result.data.report} initialError={result.data.queryError} />
    </>
  );
}
