import { ModelSetup } from "../../../features/model-setup/components/model-setup";

export default function ModelSetupRoute() {
  return <ModelSetup />;
}
