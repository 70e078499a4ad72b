/** Debian's Chromium; playwright-core drives it and downloads nothing. */
export const CHROMIUM_PATH = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";

/** Headless as root, and off the network except for the app under test. */
export const CHROMIUM_FLAGS = [
  "--no-sandbox",
  "--disable-gpu",
  "--disable-quic",
  "--no-first-run",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
  "--disable-dev-shm-usage",
];
