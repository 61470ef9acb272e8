import { PageHeader } from "../../_components/page-header";
import { SourceForm } from "../_components/source-form";
import { createSourceAction } from "../actions";

export const metadata = { title: "Add a source" };

export default function NewSourcePage() {
  return (
    <>
      <PageHeader eyebrow="Sources" title="Add a source" description="A DOI already in the collection, or the same title and year, is caught before a copy is made." />
      <div className="panel" style={{ maxWidth: 980 }}>
        <SourceForm action={createSourceAction} submitLabel="Add source" />
      </div>
    </>
  );
}
