import { PeopleAccess } from "../../../features/people-access/components/people-access";

export default function PeopleAccessRoute() {
  return <PeopleAccess />;
}
