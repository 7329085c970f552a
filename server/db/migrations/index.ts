import { Initial1796172181320 } from "./1796172181320-initial.js";

/** Every migration, oldest first. Classes rather than a glob, so tsx, vitest and the CLI load the same set. */
export const MIGRATIONS = [Initial1796172181320];
