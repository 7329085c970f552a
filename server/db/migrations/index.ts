import { Initial1796172181320 } from "./1796172181320-initial.js";
import { UsersAndMail1796172613849 } from "./1796172613849-users-and-mail.js";
import { AlertsAndOutbox1796173343319 } from "./1796173343319-alerts-and-outbox.js";
import { LayoutAuditPresets1796173669558 } from "./1796173669558-layout-audit-presets.js";
import { BatchesAndRounds1796175670496 } from "./1796175670496-batches-and-rounds.js";
import { ReadingRollups1796178460011 } from "./1796178460011-reading-rollups.js";
import { SensorCalibration1796320651006 } from "./1796320651006-sensor-calibration.js";
import { SiteAlertTiming1796320718224 } from "./1796320718224-site-alert-timing.js";
import { LeaderLease1796330000000 } from "./1796330000000-leader-lease.js";

/** Every migration, oldest first. Classes rather than a glob, so tsx, vitest and the CLI load the same set. */
export const MIGRATIONS = [Initial1796172181320, UsersAndMail1796172613849, AlertsAndOutbox1796173343319, LayoutAuditPresets1796173669558, BatchesAndRounds1796175670496, ReadingRollups1796178460011, SensorCalibration1796320651006, SiteAlertTiming1796320718224, LeaderLease1796330000000];
