/**
 * How the tests and benchmarks start Debian's chromium: its path (CHROMIUM_PATH overrides), no
 * sandbox (root in CI), and none of the background traffic a fresh profile would make.
 */
export const CHROMIUM = {
  executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
  args: [
    '--no-sandbox',
    '--disable-background-networking',
    '--disable-component-update',
    '--disable-sync',
    '--no-first-run',
    '--disable-quic',
  ],
};
