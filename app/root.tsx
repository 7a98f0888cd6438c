import fontUrl from "@fontsource-variable/source-sans-3/files/source-sans-3-latin-wght-normal.woff2?url";
import "./app.css";
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { useState, type ReactNode } from "react";
import { Links, Meta, Outlet, Scripts, ScrollRestoration } from "react-router";
import type { Route } from "./+types/root";
import { errorWords } from "./components/errorWords";
import { useNonce } from "./lib/nonce";

export const links: Route.LinksFunction = () => [
  // The one font file (app.css), fetched alongside the stylesheet rather than after it.
  { rel: "preload", href: fontUrl, as: "font", type: "font/woff2", crossOrigin: "anonymous" },
  { rel: "icon", href: "/icon.svg", type: "image/svg+xml" },
  { rel: "manifest", href: "/manifest.webmanifest" },
  { rel: "apple-touch-icon", href: "/icons/apple-touch-icon.png" },
];

export function Layout({ children }: { children: ReactNode }) {
  // The page's CSP nonce: from entry.server.tsx on the server, read from the page in the browser.
  const nonce = useNonce();
  return (
    <html lang="en">
      <head>
        <meta charSet="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <meta name="theme-color" content="#1c232e" />
        <Meta />
        <Links nonce={nonce} />
      </head>
      <body className="min-h-dvh">
        {children}
        <ScrollRestoration nonce={nonce} />
        <Scripts nonce={nonce} />
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
  // Only a 503 offers "Try again" here: the root's error can be anything.
  const { title, detail, status } = errorWords(error);
  const again = status === 503;
  return (
    <main className="mx-auto max-w-xl p-6">
      <h1 className="text-2xl font-bold">{title}</h1>
      <p className="mt-2 text-ink-soft">{detail}</p>
      <p className="mt-6 flex flex-wrap gap-3">
        {again && (
          <a className="btn-primary" href="">
            Try again
          </a>
        )}
        <a className="btn-quiet" href="/">
          Back to my home
        </a>
      </p>
    </main>
  );
}
