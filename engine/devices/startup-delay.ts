import { z } from "zod";

/**
 * Delay after bus power returns (and at first start) before a device sends its
 * status objects and reads its read-on-init objects, seconds. KNX devices
 * commonly offer such a parameter, a few seconds by default, so a line that
 * powers up at once is not flooded (common practice, no published source);
 * the runtime adds a spread by individual address (engine/sim/device-runtime.ts).
 */
export const startupDelaySchema = z
  .number()
  .min(0, "startupDelayS must be 0 s or more")
  .max(600, "startupDelayS must be at most 600 s")
  .default(2);
