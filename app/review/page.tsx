import { getReviewQueue } from "@/lib/server/review-queue";
import { LoadError } from "../_components/load-error";
import { PageHeader } from "../_components/page-header";
import { plural } from "../_components/format";
import { QueueSidebar } from "./_components/queue-sidebar";
import { ReviewQueueView } from "./_components/review-queue";
import "./review.css";

export const dynamic = "force-dynamic";
export const metadata = { title: "Review queue" };

type Props = { searchParams: Promise<{ code?: string; source?: string; page?: string }> };

export default async function ReviewPage({ searchParams }: Props) {
  const { code, source, page } = await searchParams;
  const result = await getReviewQueue({ code, sourceId: source, page });
  if (!result.ok) return <LoadError error={result.error} what="the review queue" />;
  const q = result.data;
  const open = Object.values(q.counts.bySeverity).reduce((a, b) => a + b, 0);
  return (
    <>
      <PageHeader
        eyebrow="Review"
        title="Review queue"
        description={`${plural(open, "open flag")} on ${plural(q.counts.records, "record")}, worst first. Work through them with the keyboard: press ? for the shortcuts.`}
      />
      <div className="review-layout">
        <QueueSidebar counts={q.counts} ruleTitles={q.ruleTitles} filter={q.filter} />
        <ReviewQueueView queue={q} />
      </div>
    </>
  );
}
