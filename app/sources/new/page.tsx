import { PageHeader } from "../../_components/page-header";
import { SourceIntake } from "../_components/source-intake";
import { createSourceAction } from "../actions";

export const metadata = { title: "Add a source" };

export default function NewSourcePage() {
  return (
    <>
      <PageHeader eyebrow="Sources" title="Add a source" description="A DOI already in the collection, or the same title and year, is caught before a copy is made." />
      <SourceIntake action={createSourceAction} />
    </>
  );
}
