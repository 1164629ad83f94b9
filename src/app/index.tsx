import { useState } from "react";
import { RouterProvider } from "react-router";
import { createQueryClient } from "@/lib/query-client";
import { AppProvider } from "./provider";
import { createAppRouter } from "./router";

export function App() {
  // One query client and one router for the life of the page.
  const [queryClient] = useState(createQueryClient);
  const [router] = useState(() => createAppRouter(queryClient));
  return (
    <AppProvider queryClient={queryClient}>
      <RouterProvider router={router} />
    </AppProvider>
  );
}
