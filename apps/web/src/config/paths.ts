// Every path of the web app, in one place. Routes use `path`, links use `getHref`.

/** Only same-site paths may be used as a redirect target after sign-in. */
export function safeRedirectTarget(target: string | null | undefined): string | null {
  if (!target || !target.startsWith("/") || target.startsWith("//") || target.startsWith("/\\")) return null;
  return target;
}

export const paths = {
  home: { path: "/", getHref: () => "/" },
  auth: {
    signIn: {
      path: "/sign-in",
      getHref: (redirectTo?: string | null) => {
        const target = safeRedirectTarget(redirectTo);
        return target && target !== "/" ? `/sign-in?redirectTo=${encodeURIComponent(target)}` : "/sign-in";
      },
    },
    /** The public page an invitation e-mail links to. */
    invite: { path: "/invite/:token", getHref: (token: string) => `/invite/${encodeURIComponent(token)}` },
  },
  app: {
    portfolioMap: { path: "/portfolio-map", getHref: () => "/portfolio-map" },
    brandComparison: { path: "/brand-comparison", getHref: () => "/brand-comparison" },
    marketDesk: { path: "/market-desk", getHref: () => "/market-desk" },
    channelSheet: {
      path: "/channel-sheet",
      /** One cell × channel; without them the sheet asks which. */
      getHref: (selection?: { cellId: string; channel: string }) =>
        selection ? `/channel-sheet?${new URLSearchParams({ cell: selection.cellId, channel: selection.channel }).toString()}` : "/channel-sheet",
    },
    dataIntake: { path: "/data-intake", getHref: () => "/data-intake" },
    modelSetup: { path: "/model-setup", getHref: () => "/model-setup" },
    runs: { path: "/runs", getHref: () => "/runs" },
    poolingReview: { path: "/pooling-review", getHref: () => "/pooling-review" },
    spendPlanner: { path: "/spend-planner", getHref: () => "/spend-planner" },
    budgetSplit: { path: "/budget-split", getHref: () => "/budget-split" },
    peopleAccess: { path: "/people-access", getHref: () => "/people-access" },
    portfolioSettings: { path: "/portfolio-settings", getHref: () => "/portfolio-settings" },
    outbox: { path: "/outbox", getHref: () => "/outbox" },
  },
  /** Pages below a screen, open to the same roles as the screen they belong to. */
  detail: {
    run: { screen: "runs", path: "/runs/:runId", getHref: (runId: string) => `/runs/${encodeURIComponent(runId)}` },
  },
} as const;

export type ScreenKey = keyof typeof paths.app;
