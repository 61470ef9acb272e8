import Link from "next/link";
import type { QueueRecordView } from "@/lib/server/review-queue";
import { formatNumber } from "../../_components/format";
import { OutcomeLabel } from "../../_components/outcome-label";
import { StatusBadge } from "../../_components/status-badge";

interface Row {
  label: string;
  a: string;
  b: string;
}

function rows(a: QueueRecordView, b: QueueRecordView): Row[] {
  const out: Row[] = [
    { label: "Source", a: `${a.source.year ?? "n.d."} · ${a.source.title}`, b: `${b.source.year ?? "n.d."} · ${b.source.title}` },
    { label: "Where", a: [a.locationLabel, a.locationPage ? `p. ${a.locationPage}` : null].filter(Boolean).join(", ") || "—", b: [b.locationLabel, b.locationPage ? `p. ${b.locationPage}` : null].filter(Boolean).join(", ") || "—" },
    { label: "Alloy", a: a.alloyKey, b: b.alloyKey },
    { label: "Machine", a: a.machine ?? "—", b: b.machine ?? "—" },
    { label: "Atmosphere", a: a.atmosphere ?? "—", b: b.atmosphere ?? "—" },
  ];
  const fields = new Map<string, { label: string; unit: string; a: number | null; b: number | null }>();
  for (const v of a.values) fields.set(v.field, { label: v.label, unit: v.unit, a: v.canonical, b: null });
  for (const v of b.values) {
    const f = fields.get(v.field);
    if (f) f.b = v.canonical;
    else fields.set(v.field, { label: v.label, unit: v.unit, a: null, b: v.canonical });
  }
  for (const f of fields.values()) out.push({ label: `${f.label} (${f.unit})`, a: formatNumber(f.a, 3), b: formatNumber(f.b, 3) });
  out.push({ label: "Outcome", a: a.outcome, b: b.outcome });
  return out;
}

/** Two records of a duplicate or conflict flag side by side; rows that differ are marked. */
export function PairView({ record, other }: { record: QueueRecordView; other: QueueRecordView }) {
  const list = rows(record, other);
  return (
    <div className="table-wrap pair-view">
      <table className="table">
        <caption className="visually-hidden">
          Record {record.id} beside record {other.id}
        </caption>
        <thead>
          <tr>
            <th scope="col">Field</th>
            <th scope="col">
              This record <Link href={`/records/${record.id}`}>#{record.id}</Link> <StatusBadge status={record.status} />
            </th>
            <th scope="col">
              Earlier record <Link href={`/records/${other.id}`}>#{other.id}</Link> <StatusBadge status={other.status} />
            </th>
          </tr>
        </thead>
        <tbody>
          {list.map((r) => {
            const differs = r.a !== r.b;
            return (
              <tr key={r.label} className={differs ? "pair-view__differs" : undefined}>
                <th scope="row">
                  {r.label}
                  {differs ? <span className="visually-hidden"> (differs)</span> : null}
                </th>
                <td className="num">{r.label === "Outcome" ? <OutcomeLabel outcome={r.a} /> : r.a}</td>
                <td className="num">{r.label === "Outcome" ? <OutcomeLabel outcome={r.b} /> : r.b}</td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
