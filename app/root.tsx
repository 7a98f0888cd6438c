import "@fontsource/source-sans-3/latin-400.css";
import "@fontsource/source-sans-3/latin-600.css";
import "@fontsource/source-sans-3/latin-700.css";
import "./app.css";
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { useState, type ReactNode } from "react";
import { isRouteErrorResponse, Links, Meta, Outlet, Scripts, ScrollRestoration } from "react-router";
import type { Route } from "./+types/root";

export const links: Route.LinksFunction = () => [
  { rel: "icon", href: "/icon.svg", type: "image/svg+xml" },
  { rel: "manifest", href: "/manifest.webmanifest" },
];

export function Layout({ children }: { children: ReactNode }) {
  return (
    <html lang="en">
      <head>
        <meta charSet="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <meta name="theme-color" content="#1c232e" />
        <Meta />
        <Links />
      </head>
      <body className="min-h-dvh">
        {children}
        <ScrollRestoration />
        <Scripts />
      </body>
    </html>
  );
}

export default function App() {
  // One client per browser session, made inside the component (never shared between requests).
  const [queryClient] = useState(() => new QueryClient({ defaultOptions: { queries: { staleTime: 30_000, retry: 1 } } }));
  return (
    <QueryClientProvider client={queryClient}>
      <Outlet />
    </QueryClientProvider>
  );
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  let title = "Something went wrong";
  let detail = "Cluepath hit an unexpected error. Your earlier entries are saved; go back and try again.";
  if (isRouteErrorResponse(error)) {
    const message = typeof error.data === "object" && error.data && "error" in error.data ? String(error.data.error) : undefined;
    if (error.status === 404) {
      title = "Not found";
      detail = message ?? "There is nothing at this address, or it belongs to another shop.";
    } else if (error.status === 403) {
      title = "Not for your role";
      detail = message ?? "Your role cannot open this page.";
    } else {
      title = `Error ${error.status}`;
      detail = message ?? error.statusText;
    }
  }
  return (
    <main className="mx-auto max-w-xl p-6">
      <h1 className="text-2xl font-bold">{title}</h1>
      <p className="mt-2 text-ink-soft">{detail}</p>
      <p className="mt-6">
        <a className="btn-quiet" href="/">
          Back to my home
        </a>
      </p>
    </main>
  );
}
