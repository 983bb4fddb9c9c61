import { reactRouter } from "@react-router/dev/vite";
import tailwindcss from "@tailwindcss/vite";
import { defineConfig } from "vitest/config";
import { fileURLToPath } from "node:url";

const serverOnly = ["@mikro-orm/core", "@mikro-orm/postgresql", "@mikro-orm/migrations", "@mikro-orm/knex"];

export default defineConfig({
  // The React Router plugin builds the app; vitest runs modules without it.
  plugins: [tailwindcss(), !process.env.VITEST && reactRouter()],
  resolve: { alias: { "~": fileURLToPath(new URL("./app", import.meta.url)) } },
  // The ORM and auth packages are server-only; pre-bundling them for the browser makes the
  // dev server reload in a loop.
  optimizeDeps: { exclude: [...serverOnly, "remix-auth", "remix-auth-form"] },
  ssr: { external: serverOnly },
  server: { host: "127.0.0.1" },
  test: {
    // Integration and browser tests share PostgreSQL databases: one file at a time.
    fileParallelism: false,
    projects: [
      {
        extends: true,
        test: { name: "unit", include: ["app/**/*.test.{ts,tsx}"], environment: "node" },
      },
      {
        extends: true,
        test: {
          name: "integration",
          include: ["tests/integration/**/*.test.ts"],
          env: { VISITWORT_DB: "test" },
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
      {
        extends: true,
        test: {
          name: "browser",
          include: ["tests/e2e/**/*.test.ts"],
          globalSetup: ["tests/e2e/serve.ts"],
          // A page can take seconds to settle on a loaded 2-core machine; poll that long.
          expect: { poll: { timeout: 10_000, interval: 100 } },
          env: { VISITWORT_DB: "e2e" },
          // Whole journeys through several pages; a loaded 2-core machine needs the headroom.
          testTimeout: 180_000,
          hookTimeout: 60_000,
        },
      },
    ],
  },
});
