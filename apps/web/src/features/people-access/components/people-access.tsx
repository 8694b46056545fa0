import { EmptyState } from "../../../components/ui/empty-state";
import { PageHeader } from "../../../components/ui/page-header";
import { ScreenOutline } from "../../../components/ui/screen-outline";

const outline = [
  "Everyone with access, their role and, for market managers, the markets they look after",
  "Invite people by e-mail and change roles and market scopes",
  "Portfolio settings: reporting currency, channel list, customer value per brand",
  "The audit log: who changed what, and when",
];

export function PeopleAccess() {
  return (
    <>
      <PageHeader
        title="People & access"
        description="Who can use this workspace, in which role, and what changed."
      />
      <ScreenOutline items={outline} />
      <EmptyState title="Nothing here yet">
        The list of people, invitations and the audit log will appear on this screen. It is not connected yet.
      </EmptyState>
    </>
  );
}
