import type { Role } from "@tributary/contracts";
import { paths, type ScreenKey } from "../config/paths";
import { screens, screenSectionLabels, type ScreenSection } from "../config/screens";

const dashboards: ScreenKey[] = ["portfolioMap", "brandComparison", "marketDesk", "channelSheet"];
const planning: ScreenKey[] = ["spendPlanner", "budgetSplit"];

/** Which roles may use each screen. The API enforces the same rules on every request. */
const screensByRole: Record<Role, ReadonlySet<ScreenKey>> = {
  admin: new Set(Object.keys(screens) as ScreenKey[]),
  portfolio_lead: new Set([...dashboards, ...planning]),
  analyst: new Set([...dashboards, "dataIntake", "modelSetup", "runs", "poolingReview", ...planning]),
  market_manager: new Set(["marketDesk", "portfolioMap", "brandComparison", "channelSheet", "spendPlanner"]),
};

export function canUseScreen(role: Role, screen: ScreenKey): boolean {
  return screensByRole[role].has(screen);
}

/** Where a role lands after signing in. */
export function homeScreenFor(role: Role): ScreenKey {
  return role === "market_manager" ? "marketDesk" : "portfolioMap";
}

export type NavigationItem = { screen: ScreenKey; label: string; href: string };
export type NavigationSection = { section: ScreenSection; label: string; items: NavigationItem[] };

/** The navigation a role sees: only the screens it may use, grouped, its home first. */
export function navigationFor(role: Role): NavigationSection[] {
  const home = homeScreenFor(role);
  const sections = new Map<ScreenSection, NavigationItem[]>();
  for (const [screen, meta] of Object.entries(screens) as [ScreenKey, (typeof screens)[ScreenKey]][]) {
    if (!canUseScreen(role, screen)) continue;
    const item = { screen, label: meta.label, href: paths.app[screen].getHref() };
    const items = sections.get(meta.section) ?? [];
    if (screen === home) items.unshift(item);
    else items.push(item);
    sections.set(meta.section, items);
  }
  return [...sections.entries()].map(([section, items]) => ({ section, label: screenSectionLabels[section], items }));
}
