import { useQueryErrorResetBoundary } from "@tanstack/react-query";
import { isRouteErrorResponse, useRevalidator, useRouteError } from "react-router-dom";
import { ErrorState } from "../components/ui/error-state";
import { ApiError } from "../lib/api-client";

/** What a screen shows when loading it failed. */
export function RouteError() {
  const error = useRouteError();
  const revalidator = useRevalidator();
  const { reset } = useQueryErrorResetBoundary();
  const message =
    error instanceof ApiError
      ? error.message
      : isRouteErrorResponse(error)
        ? `${error.status} ${error.statusText}`
        : "An unexpected error stopped this screen from loading.";
  return (
    <ErrorState
      title="This screen could not be loaded"
      message={message}
      onRetry={() => {
        reset();
        void revalidator.revalidate();
      }}
    />
  );
}

/** The whole app failed before any screen could show. */
export function AppError() {
  return (
    <main id="main" className="mx-auto max-w-xl px-6 py-16">
      <RouteError />
    </main>
  );
}
