// Shared by the README's two commands. Plain Node.js: it runs before anything is installed.
import { spawn, spawnSync } from "node:child_process";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { randomBytes } from "node:crypto";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";

export const root = join(dirname(fileURLToPath(import.meta.url)), "..");
export const stateDir = join(root, ".coldtrail");
const PNPM_VERSION = JSON.parse(readFileSync(join(root, "package.json"), "utf8")).packageManager.split("@")[1];

/** pnpm at the version the lockfile was made with: the one on PATH if it matches, else through npx. */
export function pnpmCommand() {
  const probe = spawnSync("pnpm", ["--version"], { encoding: "utf8" });
  if (probe.status === 0 && probe.stdout.trim() === PNPM_VERSION) return ["pnpm"];
  return ["npx", "-y", `pnpm@${PNPM_VERSION}`];
}

export function run(cmd, args, opts = {}) {
  console.log(`\n› ${[cmd, ...args].join(" ")}`);
  const res = spawnSync(cmd, args, { stdio: "inherit", cwd: root, ...opts, env: { ...process.env, ...opts.env } });
  if (res.status !== 0) {
    console.error(`✗ ${cmd} ${args.join(" ")} failed (exit ${res.status ?? res.signal})`);
    process.exit(res.status ?? 1);
  }
}

export function pnpm(args, opts) {
  const [cmd, ...pre] = pnpmCommand();
  run(cmd, [...pre, ...args], opts);
}

export function install() {
  // better-sqlite3 compiles against the local Node.js headers (see .pnpmfile.cjs).
  pnpm(["install", "--frozen-lockfile"], { env: { npm_config_nodedir: process.env.npm_config_nodedir ?? "/usr" } });
}

/** A random secret kept in .coldtrail/ for local sign-in cookies. Never used in production. */
export function devSecret() {
  mkdirSync(stateDir, { recursive: true });
  const file = join(stateDir, "dev-secret");
  if (!existsSync(file)) writeFileSync(file, randomBytes(32).toString("hex"), { mode: 0o600 });
  return readFileSync(file, "utf8").trim();
}

export function start(cmd, args, opts = {}) {
  const child = spawn(cmd, args, { stdio: "inherit", cwd: root, ...opts, env: { ...process.env, ...opts.env } });
  return child;
}

export const tsxBin = join(root, "node_modules", "tsx", "dist", "cli.mjs");
export const nextBin = join(root, "apps", "web", "node_modules", "next", "dist", "bin", "next");

/** Ports of one end-to-end run, all derived from E2E_PORT (default 3100). */
export function e2ePorts(appPort = Number(process.env.E2E_PORT ?? 3100)) {
  const offset = appPort - 3100;
  return { app: appPort, smtp: 2600 + offset, mailUi: 2700 + offset, s3: 4600 + offset };
}

/**
 * Debian's Chromium for the browser tests. When it is missing and this user may install packages
 * (root, or sudo without a password), it is installed; otherwise the one command to run is printed.
 */
export function ensureChromium(path = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium") {
  if (existsSync(path)) return path;
  const isRoot = typeof process.getuid === "function" && process.getuid() === 0;
  const sudo = !isRoot && spawnSync("sudo", ["-n", "true"], { stdio: "ignore" }).status === 0;
  const hasApt = spawnSync("apt-get", ["--version"], { stdio: "ignore" }).status === 0;
  if (path === "/usr/bin/chromium" && hasApt && (isRoot || sudo)) {
    console.log("\n› Chromium is missing: installing Debian's package for the browser tests");
    const pre = isRoot ? [] : ["sudo", "-n"];
    const env = { DEBIAN_FRONTEND: "noninteractive" };
    const apt = (args) => {
      const [cmd, ...rest] = [...pre, "apt-get", ...args];
      return spawnSync(cmd, rest, { stdio: "inherit", env: { ...process.env, ...env } }).status === 0;
    };
    if (!apt(["install", "-y", "--no-install-recommends", "chromium"])) {
      apt(["update", "-y"]);
      apt(["install", "-y", "--no-install-recommends", "chromium"]);
    }
    if (existsSync(path)) return path;
  }
  console.error(
    `✗ Chromium not found at ${path}. Install Debian's package with:\n    sudo apt-get install -y chromium\n  (or set CHROMIUM_PATH to another Chromium), then run npm test again.`,
  );
  process.exit(1);
}
