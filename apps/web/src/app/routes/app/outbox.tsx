import { Outbox } from "../../../features/outbox/components/outbox";

export default function OutboxRoute() {
  return <Outbox />;
}
