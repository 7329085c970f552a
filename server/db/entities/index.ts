import { AlertEntity, AlertNoticeEntity, AlertTrackerEntity, DutyShiftEntity } from "./alert.entity.js";
import { AppMetaEntity } from "./app-meta.entity.js";
import { BenchEntity } from "./bench.entity.js";
import { CaughtMailEntity } from "./caught-mail.entity.js";
import { OutboxEntity } from "./outbox.entity.js";
import { LatestReadingEntity, ReadingEntity, ReadingRollupEntity, ReadingRollupStaleEntity } from "./reading.entity.js";
import { SensorEntity } from "./sensor.entity.js";
import { SiteEntity } from "./site.entity.js";
import { SignInFailureEntity, UserEntity } from "./user.entity.js";
import { BenchWindowEntity, ZoneWindowEntity } from "./window.entity.js";
import { ZoneEntity } from "./zone.entity.js";
import { AuditEntryEntity } from "./audit-entry.entity.js";
import { SensorAssignmentEntity } from "./sensor-assignment.entity.js";
import { WindowPresetEntity } from "./window-preset.entity.js";
import { BatchEntity, BatchPlacementEntity } from "./batch.entity.js";
import { ObservationEntity, ObservationPhotoEntity } from "./observation.entity.js";
import { WalkRoundBenchEntity, WalkRoundEntity } from "./walk-round.entity.js";
import { LeaderLeaseEntity } from "./leader-lease.entity.js";

export const ENTITIES = [
  AppMetaEntity,
  SiteEntity,
  ZoneEntity,
  BenchEntity,
  SensorEntity,
  ZoneWindowEntity,
  BenchWindowEntity,
  ReadingEntity,
  LatestReadingEntity,
  UserEntity,
  SignInFailureEntity,
  CaughtMailEntity,
  AlertEntity,
  AlertTrackerEntity,
  AlertNoticeEntity,
  DutyShiftEntity,
  OutboxEntity,
  SensorAssignmentEntity,
  AuditEntryEntity,
  WindowPresetEntity,
  BatchEntity,
  BatchPlacementEntity,
  ObservationEntity,
  ObservationPhotoEntity,
  WalkRoundEntity,
  WalkRoundBenchEntity,
  ReadingRollupEntity,
  ReadingRollupStaleEntity,
  LeaderLeaseEntity,
];
