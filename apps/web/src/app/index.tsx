import { useState } from "react";
import { createBrowserRouter, RouterProvider } from "react-router-dom";
import { createQueryClient } from "../lib/query-client";
import { AppProvider } from "./provider";
import { createAppRoutes } from "./router";

export function App() {
  const [queryClient] = useState(createQueryClient);
  const [router] = useState(() => createBrowserRouter(createAppRoutes(queryClient)));
  return (
    <AppProvider queryClient={queryClient}>
      <RouterProvider router={router} />
    </AppProvider>
  );
}
