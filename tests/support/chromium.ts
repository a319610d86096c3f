/** Vitest global set-up for the e2e group: Debian's Chromium must be installed. */
import { existsSync } from 'node:fs';

export const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';

export default function setup(): void {
  if (!existsSync(CHROMIUM)) {
    throw new Error(`The e2e tests need Chromium at ${CHROMIUM}. Install it with: apt-get install -y chromium`);
  }
}
