import type { Flag } from "@tributary/contracts";
import { FlagBadge } from "../../../components/estimate/flag-badge";
import { formatDateTime } from "../../../lib/format";

/** Every flag raised on this cell × channel, active ones first: what, why, who and when. */
export function FlagHistory({ flags }: { flags: Flag[] }) {
  if (flags.length === 0) return null;
  const ordered = [...flags].sort((a, b) => Number(b.active) - Number(a.active));
  return (
    <section aria-label="Flags on this estimate" className="rounded-lg border border-line bg-surface px-4 py-3 shadow-card">
      <h2 className="text-body font-semibold text-ink-900">Flags on this estimate</h2>
      <ul className="mt-2 space-y-2">
        {ordered.map((flag) => (
          <li key={flag.id} className={`flex flex-wrap items-start gap-x-3 gap-y-1 text-small ${flag.active ? "" : "text-ink-600"}`}>
            <FlagBadge kind={flag.kind} />
            <span className="min-w-0 flex-1">
              “{flag.note}”{" "}
              <span className="text-caption text-ink-600">
                {flag.createdBy ? `${flag.createdBy.name}, ` : ""}
                {formatDateTime(flag.createdAt)}
                {flag.active ? "" : ` · cleared${flag.clearedBy ? ` by ${flag.clearedBy.name}` : ""}${flag.clearedAt ? `, ${formatDateTime(flag.clearedAt)}` : ""}`}
              </span>
            </span>
          </li>
        ))}
      </ul>
    </section>
  );
}
