import { Runs } from "../../../features/runs/components/runs";

export default function RunsRoute() {
  return <Runs />;
}
