import { roleLabels } from "@tributary/contracts";
import { useEffect, type ReactNode } from "react";
import { NotAvailable } from "../components/ui/not-available";
import { paths, type ScreenKey } from "../config/paths";
import { screens } from "../config/screens";
import { useSignedInUser } from "../features/auth/api/get-current-user";
import { canUseScreen, homeScreenFor } from "../lib/authorization";

/** Shows a screen only to roles that may use it; everyone else gets a clear explanation. */
export function ScreenGate({ screen, children }: { screen: ScreenKey; children: ReactNode }) {
  const user = useSignedInUser();
  const label = screens[screen].label;
  useEffect(() => {
    document.title = `${label} · Tributary`;
  }, [label]);
  if (!canUseScreen(user.role, screen)) {
    const home = homeScreenFor(user.role);
    return (
      <NotAvailable
        screenLabel={label}
        roleLabel={roleLabels[user.role]}
        homeHref={paths.app[home].getHref()}
        homeLabel={screens[home].label}
      />
    );
  }
  return <>{children}</>;
}
