import { ButtonLink } from "./_components/button";
import { EmptyState } from "./_components/empty-state";

export default function NotFound() {
  return (
    <div className="panel">
      <EmptyState
        title="Nothing here"
        actions={
          <>
            <ButtonLink href="/records">Browse records</ButtonLink>
            <ButtonLink href="/sources">Sources</ButtonLink>
          </>
        }
      >
        <p>The page or item you asked for does not exist. It may have a different number, or the link may be mistyped.</p>
      </EmptyState>
    </div>
  );
}
