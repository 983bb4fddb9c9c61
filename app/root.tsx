import { useEffect, useRef, useState } from "react";
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { Form, isRouteErrorResponse, Links, Meta, NavLink, Outlet, Scripts, ScrollRestoration, useLocation, useRouteLoaderData } from "react-router";
import type { Route } from "./+types/root";
import { databaseMiddleware } from "./db/orm.server";
import { currentUserMiddleware } from "./auth/current-user.server";
import { crossSiteMiddleware, securityHeadersMiddleware } from "./http/protection.server";
import { optionalUser } from "./auth/permissions.server";
import { navigationFor } from "./auth/navigation";
import { ROLE_LABELS } from "./auth/roles";
import { Mark } from "./components/Mark";
import { useNonce } from "./components/nonce";
import "./app.css";

// Order matters: headers wrap everything; cross-site writes are refused before anything reads
// the session; the user is known before any loader or action runs.
export const middleware: Route.MiddlewareFunction[] = [
  securityHeadersMiddleware,
  crossSiteMiddleware,
  databaseMiddleware,
  currentUserMiddleware,
];

export function loader({ context }: Route.LoaderArgs) {
  const user = optionalUser(context);
  return { user: user ? { name: user.name, roles: user.roles } : null };
}

export const meta: Route.MetaFunction = () => [{ title: "Visitwort" }];

export function Layout({ children }: { children: React.ReactNode }) {
  const nonce = useNonce();
  const rootData = useRouteLoaderData<typeof loader>("root");
  const user = rootData?.user ?? null;
  const navigation = navigationFor(user?.roles ?? null);
  const navRef = useRef<HTMLElement>(null);
  const { pathname } = useLocation();
  // On a phone the navigation scrolls sideways: bring the current page's item into view.
  useEffect(() => {
    const current = navRef.current?.querySelector<HTMLElement>('[aria-current="page"]');
    if (current && navRef.current && navRef.current.scrollWidth > navRef.current.clientWidth) {
      navRef.current.scrollLeft = current.offsetLeft - (navRef.current.clientWidth - current.offsetWidth) / 2;
    }
  }, [pathname]);
  return (
    <html lang="en">
      <head>
        <meta charSet="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <meta name="theme-color" content="#3f5e3a" />
        <Meta />
        <Links />
      </head>
      <body className="min-h-dvh flex flex-col bg-paper text-ink antialiased">
        <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:bg-paper focus:p-2">
          Skip to content
        </a>
        <header className="border-b border-ink/10 bg-paper-deep/60">
          <div className="mx-auto flex max-w-5xl flex-wrap items-center gap-x-3 gap-y-1 px-4 pt-3 sm:gap-x-6 pb-1 sm:pb-3">
            <a href="/" className="order-1 flex items-center gap-2 text-ink no-underline" aria-label="Visitwort, home">
              <Mark className="h-8 w-8" />
              <span className="font-display text-2xl font-semibold tracking-tight">Visitwort</span>
            </a>
            {/* On phones the navigation takes its own row under the name, scrolling sideways if long. */}
            {/* From tablets up it wraps to a second line rather than hide items. */}
            <nav ref={navRef} aria-label="Main" className="order-3 -mx-2 flex w-full items-center gap-1 overflow-x-auto sm:order-2 sm:w-auto sm:flex-1 sm:flex-wrap sm:overflow-visible">
              {navigation.map((item) => (
                <NavLink
                  key={item.to}
                  to={item.to}
                  // "Visits" must not light up on "Record" (/visits/new) too.
                  end={item.to === "/visits"}
                  className={({ isActive }) =>
                    `whitespace-nowrap rounded-md px-2.5 py-2.5 text-[0.95rem] font-medium no-underline ${
                      isActive ? "bg-moss text-paper" : "text-ink hover:bg-ink/5"
                    }`
                  }
                >
                  {item.label}
                </NavLink>
              ))}
            </nav>
            <div className="order-2 ml-auto flex items-center gap-1 text-sm sm:order-3 sm:gap-2">
              {user ? (
                <>
                  <NavLink to="/account" className="max-w-[9rem] truncate rounded-md px-2 py-2.5 font-medium text-ink no-underline hover:bg-ink/5" title={user.roles.map((r) => ROLE_LABELS[r]).join(", ")}>
                    <span className="sm:hidden">Account</span>
                    <span className="hidden sm:inline">{user.name}</span>
                  </NavLink>
                  <Form method="post" action="/logout">
                    <button type="submit" className="min-h-11 rounded-md border border-ink/25 px-3 font-medium hover:bg-ink/5">
                      Sign out
                    </button>
                  </Form>
                </>
              ) : (
                <NavLink to="/login" className="inline-flex min-h-11 items-center rounded-md border border-moss px-3 font-semibold text-moss-deep no-underline hover:bg-moss/10">
                  Sign in
                </NavLink>
              )}
            </div>
          </div>
        </header>
        <main id="main" className="mx-auto w-full max-w-5xl flex-1 px-4 py-6">
          {children}
        </main>
        <footer className="border-t border-ink/10 text-sm text-ink-soft">
          <div className="mx-auto flex max-w-5xl flex-wrap items-center justify-between gap-2 px-4 py-4">
            <p>
              Visitwort — flower visits of bumble bees, verified and put to use.
            </p>
            <p>
              <a href="/cautions" className="font-medium">Cautions for the field and for planting</a>
            </p>
          </div>
        </footer>
        <ScrollRestoration nonce={nonce} />
        <Scripts nonce={nonce} />
      </body>
    </html>
  );
}

export default function App() {
  // One cache per browser tab (created here, not at module level, so server renders never share one).
  const [queryClient] = useState(() => new QueryClient());
  return (
    <QueryClientProvider client={queryClient}>
      <Outlet />
    </QueryClientProvider>
  );
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  let heading = "Something went wrong";
  let detail = "The page could not be shown. Try again in a moment.";
  let stack: string | undefined;
  if (isRouteErrorResponse(error)) {
    heading = error.status === 404 ? "Not found" : `${error.status} ${error.statusText}`;
    detail = error.status === 404 ? "There is nothing at this address." : typeof error.data === "string" ? error.data : detail;
  } else if (import.meta.env.DEV && error instanceof Error) {
    detail = error.message;
    stack = error.stack;
  }
  return (
    <section className="space-y-3">
      <h1 className="text-3xl">{heading}</h1>
      <p>{detail}</p>
      {stack && <pre className="overflow-x-auto rounded bg-ink/5 p-3 text-xs">{stack}</pre>}
      <p>
        <a href="/">Back to the start page</a>
      </p>
    </section>
  );
}
