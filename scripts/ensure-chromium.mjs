#!/usr/bin/env node
// Makes sure the browser tests have a Chromium to drive: Debian's package,
// never a browser download, which cannot reach the network here). Prints the path it found.
import { execFileSync, spawnSync } from "node:child_process";
import { accessSync, constants } from "node:fs";
import { delimiter, join } from "node:path";

const candidates = ["chromium", "chromium-browser"];

function findChromium() {
  const fixed = "/usr/bin/chromium";
  if (isExecutable(fixed)) return fixed;
  for (const dir of (process.env.PATH ?? "").split(delimiter)) {
    for (const name of candidates) {
      const full = join(dir, name);
      if (dir && isExecutable(full)) return full;
    }
  }
  return null;
}

function isExecutable(path) {
  try {
    accessSync(path, constants.X_OK);
    return true;
  } catch {
    return false;
  }
}

function hasAptGet() {
  return spawnSync("sh", ["-c", "command -v apt-get"], { stdio: "ignore" }).status === 0;
}

let found = findChromium();
if (!found) {
  const isRoot = typeof process.getuid === "function" && process.getuid() === 0;
  if (isRoot && hasAptGet()) {
    console.log("Chromium not found; installing Debian's chromium package with apt-get…");
    try {
      // flock keeps two parallel installs (tests, CI, another engineer) from fighting over dpkg's lock.
      const useFlock = spawnSync("sh", ["-c", "command -v flock"], { stdio: "ignore" }).status === 0;
      const script = "apt-get update && DEBIAN_FRONTEND=noninteractive apt-get install -y chromium";
      if (useFlock) execFileSync("flock", ["/tmp/tinelog-apt.lock", "sh", "-c", script], { stdio: "inherit" });
      else execFileSync("sh", ["-c", script], { stdio: "inherit" });
    } catch {
      // fall through to the one-line message below
    }
    found = findChromium();
  }
}

if (!found) {
  console.error("Chromium is missing: install Debian's package (sudo apt-get install -y chromium) or put a chromium binary in PATH.");
  process.exit(1);
}
console.log(`Chromium: ${found}`);
