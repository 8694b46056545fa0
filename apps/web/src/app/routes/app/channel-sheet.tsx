import { ChannelSheet } from "../../../features/channel-sheet/components/channel-sheet";

export default function ChannelSheetRoute() {
  return <ChannelSheet />;
}
