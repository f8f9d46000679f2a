// How every browser test launches Debian's Chromium (never a downloaded browser): the
// Playwright config and the tests that drive a browser themselves share these options.
export const chromiumLaunchOptions = {
  executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
  args: [
    "--headless",
    "--no-sandbox",
    "--disable-gpu",
    "--disable-quic",
    "--no-first-run",
    "--disable-background-networking",
    "--disable-component-update",
    "--disable-sync",
  ],
};
