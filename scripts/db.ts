/**
 * The project's own PostgreSQL: one cluster under .data/postgres, listening on 127.0.0.1 only,
 * holding the app database and the two test databases.
 *
 *   tsx scripts/db.ts up [app|test|e2e …]   install if missing (root), init, start, create databases
 *   tsx scripts/db.ts stop                  stop the cluster
 *   tsx scripts/db.ts status                say whether it runs and where
 *   tsx scripts/db.ts url app|test|e2e      print the connection URL
 *
 * Every step is idempotent: `up` with the server already running only checks it.
 */
import { spawnSync, type SpawnSyncOptions } from "node:child_process";
import { randomBytes, createHash } from "node:crypto";
import { chmodSync, existsSync, mkdirSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import net from "node:net";
import path from "node:path";
import {
  DATABASE_NAMES,
  DATABASE_URL_VARIABLES,
  clusterStateFile,
  databaseUrl,
  projectRoot,
  readClusterState,
  type DatabaseTarget,
  type LocalClusterState,
} from "../app/db/database-url.server.ts";

// Not 5432, so a system PostgreSQL on its usual port never clashes with ours.
const DEFAULT_PORT = 54329;
const APP_ROLE = "visitwort";
const isRoot = process.getuid?.() === 0;

class Refusal extends Error {}

function fail(message: string): never {
  throw new Refusal(message);
}

function run(command: string, args: string[], options: SpawnSyncOptions = {}) {
  const result = spawnSync(command, args, { encoding: "utf8", ...options });
  if (result.error) throw result.error;
  return result;
}

/** Server programs refuse to run as root: as root, run them as the `postgres` system user. */
function runAsServerUser(command: string, args: string[], options: SpawnSyncOptions = {}) {
  if (isRoot) return run("runuser", ["-u", "postgres", "--", command, ...args], options);
  return run(command, args, options);
}

function checked(result: ReturnType<typeof run>, what: string) {
  if (result.status !== 0) {
    fail(`${what} failed:\n${String(result.stderr || result.stdout).trim()}`);
  }
  return result;
}

function findServerBinaries(): string | null {
  const root = "/usr/lib/postgresql";
  if (!existsSync(root)) return null;
  const versions = readdirSync(root)
    .filter((v) => existsSync(path.join(root, v, "bin", "postgres")) && existsSync(path.join(root, v, "bin", "initdb")))
    .sort((a, b) => Number(b) - Number(a));
  return versions[0] ? path.join(root, versions[0], "bin") : null;
}

function ensureServerInstalled(): string {
  const found = findServerBinaries();
  if (found) return found;
  if (!isRoot) {
    fail(
      "PostgreSQL server binaries are missing. Install them, then run this again:\n" +
        "  sudo apt-get update && sudo apt-get install -y postgresql",
    );
  }
  console.log("· PostgreSQL server not found: installing Debian's postgresql package (apt-get)…");
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  checked(run("apt-get", ["update"], { env, stdio: "inherit" }), "apt-get update");
  checked(run("apt-get", ["install", "-y", "--no-install-recommends", "postgresql"], { env, stdio: "inherit" }), "apt-get install postgresql");
  const installed = findServerBinaries();
  if (!installed) fail("apt-get installed postgresql but no server binaries appeared under /usr/lib/postgresql/*/bin");
  return installed;
}

function ensureServerUser() {
  if (!isRoot) return;
  if (run("id", ["-u", "postgres"]).status === 0) return;
  checked(run("useradd", ["--system", "--user-group", "--no-create-home", "--shell", "/usr/sbin/nologin", "postgres"]), "useradd postgres");
}

/**
 * The data folder must be reachable by the server user. A clone inside a root-only folder is
 * not: then the cluster lives in /var/tmp under a name derived from the project path.
 */
function chooseDataDir(): string {
  const local = path.join(projectRoot, ".data", "postgres");
  if (!isRoot) return local;
  mkdirSync(path.dirname(local), { recursive: true });
  const probe = runAsServerUser("test", ["-x", path.dirname(local)]);
  if (probe.status === 0) return local;
  const hash = createHash("sha256").update(projectRoot).digest("hex").slice(0, 12);
  const fallback = `/var/tmp/visitwort-${hash}/postgres`;
  console.log(`· ${path.dirname(local)} is not reachable by the postgres user; keeping the cluster in ${fallback}`);
  return fallback;
}

function portIsFree(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const server = net.createServer();
    server.once("error", () => resolve(false));
    server.once("listening", () => server.close(() => resolve(true)));
    server.listen(port, "127.0.0.1");
  });
}

function saveState(state: LocalClusterState) {
  mkdirSync(path.dirname(clusterStateFile), { recursive: true });
  writeFileSync(clusterStateFile, JSON.stringify(state, null, 2) + "\n", { mode: 0o600 });
  chmodSync(clusterStateFile, 0o600);
}

function initCluster(bin: string, dataDir: string, superuserPassword: string) {
  if (existsSync(path.join(dataDir, "PG_VERSION"))) return;
  console.log(`· creating a PostgreSQL cluster in ${dataDir}`);
  mkdirSync(dataDir, { recursive: true, mode: 0o700 });
  const pwfile = path.join(path.dirname(dataDir), ".pwfile");
  writeFileSync(pwfile, superuserPassword + "\n", { mode: 0o600 });
  if (isRoot) {
    checked(run("chown", ["-R", "postgres:postgres", dataDir, pwfile]), "chown data folder");
  }
  try {
    checked(
      runAsServerUser(path.join(bin, "initdb"), [
        "-D", dataDir, "-U", "postgres", "--encoding=UTF8", "--locale=C.UTF-8",
        "--auth-local=scram-sha-256", "--auth-host=scram-sha-256", `--pwfile=${pwfile}`,
      ]),
      "initdb",
    );
  } finally {
    rmSync(pwfile, { force: true });
  }
}

function runningPort(dataDir: string): number | null {
  const pidFile = path.join(dataDir, "postmaster.pid");
  if (!existsSync(pidFile)) return null;
  const lines = readFileSync(pidFile, "utf8").split("\n");
  const pid = Number(lines[0]);
  try {
    process.kill(pid, 0);
  } catch (error) {
    // EPERM means the process exists but belongs to another user: still running.
    if ((error as NodeJS.ErrnoException).code !== "EPERM") return null;
  }
  return Number(lines[3]) || null;
}

async function choosePort(remembered: number | undefined): Promise<number> {
  const configured = process.env.VISITWORT_PG_PORT ? Number(process.env.VISITWORT_PG_PORT) : undefined;
  if (configured !== undefined) {
    if (!Number.isInteger(configured) || configured < 1024 || configured > 65535) {
      fail(`VISITWORT_PG_PORT must be a port number between 1024 and 65535 (got "${process.env.VISITWORT_PG_PORT}")`);
    }
    if (!(await portIsFree(configured))) {
      fail(`Port ${configured} on 127.0.0.1 is already taken by another program; choose another with VISITWORT_PG_PORT.`);
    }
    return configured;
  }
  const preferred = remembered ?? DEFAULT_PORT;
  if (await portIsFree(preferred)) return preferred;
  // Another checkout's cluster (or another program) holds it: take the next free one and
  // remember it, rather than connecting to somebody else's database.
  for (let port = DEFAULT_PORT + 1; port < DEFAULT_PORT + 50; port++) {
    if (port !== preferred && (await portIsFree(port))) {
      console.log(`· port ${preferred} is taken; this checkout's PostgreSQL will use ${port}`);
      return port;
    }
  }
  fail(`Ports ${DEFAULT_PORT}–${DEFAULT_PORT + 49} on 127.0.0.1 are all taken; set VISITWORT_PG_PORT to a free port.`);
}

function startCluster(bin: string, dataDir: string, port: number) {
  console.log(`· starting PostgreSQL on 127.0.0.1:${port}`);
  const options = `-c listen_addresses=127.0.0.1 -p ${port} -k '${dataDir}'`;
  checked(
    runAsServerUser(path.join(bin, "pg_ctl"), ["-D", dataDir, "-l", path.join(dataDir, "server.log"), "-w", "-t", "60", "-o", options, "start"]),
    "pg_ctl start (see server.log in the data folder)",
  );
}

function psql(bin: string, state: LocalClusterState, sql: string, database = "postgres") {
  return checked(
    run(path.join(bin, "psql"), ["-h", "127.0.0.1", "-p", String(state.port), "-U", "postgres", "-d", database, "-v", "ON_ERROR_STOP=1", "-qAtc", sql], {
      env: { ...process.env, PGPASSWORD: state.superuserPassword, PGCONNECT_TIMEOUT: "10" },
    }),
    `psql: ${sql.slice(0, 60)}`,
  ).stdout.toString().trim();
}

const quoteLiteral = (value: string) => `'${value.replaceAll("'", "''")}'`;

function ensureDatabases(bin: string, state: LocalClusterState) {
  const roleExists = psql(bin, state, `SELECT 1 FROM pg_roles WHERE rolname = ${quoteLiteral(state.appRole)}`);
  if (!roleExists) {
    psql(bin, state, `CREATE ROLE ${state.appRole} LOGIN PASSWORD ${quoteLiteral(state.appPassword)}`);
  }
  for (const [target, name] of Object.entries(DATABASE_NAMES) as [DatabaseTarget, string][]) {
    const exists = psql(bin, state, `SELECT 1 FROM pg_database WHERE datname = ${quoteLiteral(name)}`);
    if (!exists) {
      psql(bin, state, `CREATE DATABASE ${name} OWNER ${state.appRole} ENCODING 'UTF8'`);
      // The test databases hold nothing anyone needs back: trade durability for speed there.
      // The app database keeps the cluster's fsync and synchronous commit.
      if (target !== "app") psql(bin, state, `ALTER DATABASE ${name} SET synchronous_commit = off`);
    }
  }
}

async function up(targets: DatabaseTarget[]) {
  if (targets.every((t) => process.env[DATABASE_URL_VARIABLES[t]])) {
    console.log(`· using ${targets.map((t) => DATABASE_URL_VARIABLES[t]).join(", ")} from the environment; no local PostgreSQL needed`);
    return;
  }
  const bin = ensureServerInstalled();
  ensureServerUser();
  const previous = readClusterState();
  const dataDir = previous?.dataDir ?? chooseDataDir();
  const state: LocalClusterState = {
    dataDir,
    port: previous?.port ?? DEFAULT_PORT,
    superuserPassword: previous?.superuserPassword ?? randomBytes(18).toString("base64url"),
    appRole: APP_ROLE,
    appPassword: previous?.appPassword ?? randomBytes(18).toString("base64url"),
  };
  saveState(state);
  initCluster(bin, dataDir, state.superuserPassword);

  const port = runningPort(dataDir);
  if (port) {
    state.port = port;
  } else {
    state.port = await choosePort(previous?.port);
    startCluster(bin, dataDir, state.port);
  }
  saveState(state);
  ensureDatabases(bin, state);
  console.log(`· PostgreSQL ready on 127.0.0.1:${state.port} (data in ${dataDir})`);
}

function stop() {
  const state = readClusterState();
  const bin = findServerBinaries();
  if (!state || !bin || !runningPort(state.dataDir)) {
    console.log("· the project's PostgreSQL is not running");
    return;
  }
  checked(runAsServerUser(path.join(bin, "pg_ctl"), ["-D", state.dataDir, "-m", "fast", "-w", "stop"]), "pg_ctl stop");
  console.log("· PostgreSQL stopped");
}

function status() {
  const state = readClusterState();
  const port = state ? runningPort(state.dataDir) : null;
  if (!state) console.log("no local cluster yet (run npm run db:up)");
  else if (port) console.log(`running on 127.0.0.1:${port}, data in ${state.dataDir}`);
  else console.log(`stopped; data in ${state.dataDir}`);
}

const [command = "up", ...rest] = process.argv.slice(2);
try {
  if (command === "up") {
    const targets = (rest.length ? rest : ["app", "test", "e2e"]) as DatabaseTarget[];
    await up(targets);
  } else if (command === "stop") stop();
  else if (command === "status") status();
  else if (command === "url") process.stdout.write(databaseUrl((rest[0] ?? "app") as DatabaseTarget) + "\n");
  else fail(`unknown command "${command}" (use up, stop, status or url)`);
} catch (error) {
  if (error instanceof Refusal) {
    console.error(`visitwort db: ${error.message}`);
    process.exit(1);
  }
  throw error;
}
