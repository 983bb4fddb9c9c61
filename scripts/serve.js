// Serves the built app: static assets, then React Router. Like react-router-serve, plus what
// the app needs from the HTTP layer: the client's address (for sign-in throttling).
//
//   node scripts/serve.js            HOST (default 127.0.0.1), PORT (default 3000)
//   TRUST_PROXY=1                    behind a reverse proxy: take the address from X-Forwarded-For
import { createRequestHandler } from "@react-router/express";
import compression from "compression";
import express from "express";
import path from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
const build = await import(pathToFileURL(path.join(root, "build/server/index.js")).href);
const host = process.env.HOST ?? "127.0.0.1";
const port = Number(process.env.PORT ?? 3000);

const app = express();
app.disable("x-powered-by");
app.set("trust proxy", process.env.TRUST_PROXY ? 1 : false);
app.use(compression());
app.use("/assets", express.static(path.join(root, "build/client/assets"), { immutable: true, maxAge: "1y" }));
app.use(express.static(path.join(root, "build/client"), { maxAge: "1h" }));
// The app reads the client's address from this header; whatever a client sent in it is replaced.
app.use((req, _res, next) => {
  req.headers["x-visitwort-client-address"] = req.ip ?? "unknown";
  next();
});
app.all("*", createRequestHandler({ build, mode: process.env.NODE_ENV }));

const server = app.listen(port, host, () => console.log(`Visitwort listening on http://${host}:${port}`));
for (const signal of ["SIGTERM", "SIGINT"]) {
  process.once(signal, () => {
    server.close();
    // The app closes its database pool on the same signal; exit once idle connections are gone.
    setTimeout(() => process.exit(0), 500).unref();
  });
}
