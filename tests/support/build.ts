/** Vitest global set-up for the integration and e2e groups: build the app once if stale. */
import { buildIfNeeded } from '../../server/build';

export default function setup(): void {
  buildIfNeeded();
}
