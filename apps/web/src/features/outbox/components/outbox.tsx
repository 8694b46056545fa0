import { EmptyState } from "../../../components/ui/empty-state";
import { PageHeader } from "../../../components/ui/page-header";
import { ScreenOutline } from "../../../components/ui/screen-outline";

const outline = [
  "Each message: recipient, subject and time sent",
  "The full message, as the recipient would read it",
  "Invitations and notices of newly published fits",
];

export function Outbox() {
  return (
    <>
      <PageHeader
        title="Outbox"
        description="In local mode, every e-mail the product sent, readable here instead of in a mailbox."
      />
      <ScreenOutline items={outline} />
      <EmptyState title="Nothing here yet">
        This screen is not connected to the outbox yet, so it shows no messages. Every e-mail the product sends will be
        listed here.
      </EmptyState>
    </>
  );
}
