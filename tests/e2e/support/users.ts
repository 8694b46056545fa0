// The demo sign-ins the server seeds, taken from the API's own list so they stay in step.
import { demoUsers } from "../../../apps/api/src/demo/users";

export type DemoUserKey = keyof typeof demoUsers;
export { demoUsers };
export const demoUserKeys = Object.keys(demoUsers) as DemoUserKey[];
