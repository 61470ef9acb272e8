/**
 * TEST HELPER ONLY: marks records accepted by writing their status straight into the temporary
 * test database, standing in for a reviewer working through the review queue. Never used by the
 * application; exports read accepted records only by default, and tests need some.
 */
import { sqlite } from "@/lib/db/connection";

export function acceptRecordsForTest(ids?: readonly number[]): number {
  const db = sqlite();
  if (!ids) return db.prepare(`UPDATE BuildRecord SET status = 'accepted', version = version + 1 WHERE status = 'needs_review'`).run().changes;
  const stmt = db.prepare(`UPDATE BuildRecord SET status = 'accepted', version = version + 1 WHERE id = ?`);
  return db.transaction(() => ids.reduce((n, id) => n + stmt.run(id).changes, 0))();
}
