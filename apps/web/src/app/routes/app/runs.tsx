import { paths } from "../../../config/paths";
import { Runs } from "../../../features/runs/components/runs";

export default function RunsRoute() {
  return <Runs runHref={paths.detail.run.getHref} modelSetupHref={paths.app.modelSetup.getHref()} />;
}
