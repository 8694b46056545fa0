import type { QueryClient } from "@tanstack/react-query";
import type { ComponentType } from "react";
import { type LoaderFunction, type LoaderFunctionArgs, type RouteObject } from "react-router-dom";
import { LoadingState } from "../components/ui/loading-state";
import { paths, type ScreenKey } from "../config/paths";
import { currentUserQueryOptions } from "../features/auth/api/get-current-user";
import { canUseScreen } from "../lib/authorization";
import { AppError, RouteError } from "./route-error";
import HomeRoute from "./routes/app/home";
import AppRoot, { clientLoader as appRootLoader } from "./routes/app/root";
import { NotFound } from "./routes/not-found";
import SignInRoute, { clientLoader as signInLoader } from "./routes/sign-in";
import { ScreenGate } from "./screen-gate";

/** What every screen's route module exports: the screen and, if it needs data, a loader. */
export type ScreenRouteModule = {
  default: ComponentType;
  clientLoader?: (queryClient: QueryClient) => LoaderFunction;
};

const screenModules: Record<ScreenKey, () => Promise<ScreenRouteModule>> = {
  portfolioMap: () => import("./routes/app/portfolio-map"),
  brandComparison: () => import("./routes/app/brand-comparison"),
  marketDesk: () => import("./routes/app/market-desk"),
  channelSheet: () => import("./routes/app/channel-sheet"),
  dataIntake: () => import("./routes/app/data-intake"),
  modelSetup: () => import("./routes/app/model-setup"),
  runs: () => import("./routes/app/runs"),
  poolingReview: () => import("./routes/app/pooling-review"),
  spendPlanner: () => import("./routes/app/spend-planner"),
  budgetSplit: () => import("./routes/app/budget-split"),
  peopleAccess: () => import("./routes/app/people-access"),
  portfolioSettings: () => import("./routes/app/portfolio-settings"),
  outbox: () => import("./routes/app/outbox"),
};

/** Pages below a screen (e.g. one run's report), gated like their screen. */
const detailModules: Record<keyof typeof paths.detail, () => Promise<ScreenRouteModule>> = {
  run: () => import("./routes/app/run"),
};

function screenRoute(
  queryClient: QueryClient,
  screen: ScreenKey,
  path: string = paths.app[screen].path,
  load: () => Promise<ScreenRouteModule> = screenModules[screen],
): RouteObject {
  return {
    path,
    ErrorBoundary: RouteError,
    lazy: async () => {
      const module = await load();
      const Screen = module.default;
      return {
        loader: async (args: LoaderFunctionArgs) => {
          const user = await queryClient.ensureQueryData(currentUserQueryOptions());
          // A role that may not use the screen loads nothing; the gate explains why.
          if (!user || !canUseScreen(user.role, screen) || !module.clientLoader) return null;
          return module.clientLoader(queryClient)(args);
        },
        Component: () => (
          <ScreenGate screen={screen}>
            <Screen />
          </ScreenGate>
        ),
      };
    },
  };
}

export function createAppRoutes(queryClient: QueryClient): RouteObject[] {
  return [
    {
      path: paths.auth.signIn.path,
      loader: signInLoader(queryClient),
      Component: SignInRoute,
      ErrorBoundary: AppError,
      HydrateFallback: () => <LoadingState />,
    },
    {
      path: paths.auth.invite.path,
      lazy: async () => ({ Component: (await import("./routes/invite")).default }),
      ErrorBoundary: AppError,
      HydrateFallback: () => <LoadingState />,
    },
    {
      path: paths.home.path,
      loader: appRootLoader(queryClient),
      Component: AppRoot,
      ErrorBoundary: AppError,
      HydrateFallback: () => <LoadingState />,
      children: [
        { index: true, Component: HomeRoute },
        ...(Object.keys(screenModules) as ScreenKey[]).map((screen) => screenRoute(queryClient, screen)),
        ...(Object.keys(detailModules) as (keyof typeof paths.detail)[]).map((page) =>
          screenRoute(queryClient, paths.detail[page].screen, paths.detail[page].path, detailModules[page]),
        ),
        { path: "*", Component: NotFound },
      ],
    },
  ];
}
