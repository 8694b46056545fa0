import { DataIntake } from "../../../features/data-intake/components/data-intake";

export default function DataIntakeRoute() {
  return <DataIntake />;
}
