import type { CurrentUser, Market } from "@tributary/contracts";
import { PageHeader } from "../../../components/ui/page-header";
import { usePeople } from "../api/get-people";
import { AuditLog } from "./audit-log";
import { InvitationsTable } from "./invitations-table";
import { InviteForm } from "./invite-form";
import { PeopleTable } from "./people-table";

/** Admins: who can use the workspace, in which role and markets, invitations and the audit log. */
export function PeopleAccess({ user, markets }: { user: CurrentUser; markets: readonly Market[] }) {
  const people = usePeople();
  return (
    <>
      <PageHeader title="People & access" description="Who can use this workspace, in which role, and what changed." />
      <div className="space-y-10">
        <section aria-labelledby="people-title" className="space-y-3">
          <h2 id="people-title" className="text-heading font-semibold text-ink-900">
            People
          </h2>
          <PeopleTable user={user} markets={markets} />
        </section>
        <InviteForm markets={markets} />
        <section aria-labelledby="invitations-title" className="space-y-3">
          <h2 id="invitations-title" className="text-heading font-semibold text-ink-900">
            Invitations
          </h2>
          <InvitationsTable />
        </section>
        <section aria-labelledby="audit-title" className="space-y-3">
          <h2 id="audit-title" className="text-heading font-semibold text-ink-900">
            Audit log
          </h2>
          <AuditLog people={people.data ?? []} />
        </section>
      </div>
    </>
  );
}
