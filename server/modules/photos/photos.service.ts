import { createHash, randomUUID } from "node:crypto";
import { mkdirSync, writeFileSync } from "node:fs";
import { rm } from "node:fs/promises";
import { join, resolve, sep } from "node:path";
import sharp, { type OutputInfo } from "sharp";
import { In, type DataSource } from "typeorm";
import { PHOTO_LIMITS, type PhotoView } from "../../../shared/schemas/batches.js";
import { ObservationEntity, ObservationPhotoEntity, type ObservationPhotoRecord } from "../../db/entities/observation.entity.js";
import type { Principal } from "../../lib/auth.js";
import { AppError, notFound } from "../../lib/errors.js";
import { actorName, isUniqueViolation } from "../batches/bench-context.js";

/** The formats accepted, as sharp names them. */
type PhotoFormat = (typeof PHOTO_LIMITS.formats)[number];

/** Stored files are named by us only: a UUID, then ".jpg" or "-thumb.jpg". Nothing else is ever served. */
const STORED_NAME = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}(-thumb)?\.jpg$/;

/** A decoding bomb guard: at most 50 megapixels (a tablet camera takes 8–12). */
const MAX_INPUT_PIXELS = 50_000_000;

/**
 * The format the first bytes announce (JPEG SOI + marker, PNG signature, RIFF…WEBP), or null.
 * A cheap first check before the decoder sees the bytes; sharp's own reading must agree.
 */
export function sniffImageFormat(bytes: Buffer): PhotoFormat | null {
  if (bytes.length >= 3 && bytes[0] === 0xff && bytes[1] === 0xd8 && bytes[2] === 0xff) return "jpeg";
  if (bytes.length >= 8 && bytes.subarray(0, 8).equals(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]))) return "png";
  if (bytes.length >= 12 && bytes.toString("latin1", 0, 4) === "RIFF" && bytes.toString("latin1", 8, 12) === "WEBP") return "webp";
  return null;
}

interface Prepared {
  sha256: string;
  full: { data: Buffer; width: number; height: number };
  thumbnail: { data: Buffer; width: number; height: number };
}

/** One uploaded file as the routes hand it over (multer's memory storage); its name and type are never trusted. */
export interface UploadedFile {
  buffer: Buffer;
  size: number;
}

/**
 * Observation photos on disk beside the database (`<database folder>/photos/`), under generated
 * names, with a thumbnail made on upload. Every image is judged by its content, turned upright
 * (EXIF orientation), stripped of metadata (GPS and camera data never leave the tablet's upload)
 * and re-encoded as JPEG.
 */
export class PhotosService {
  private readonly dir: string;

  constructor(
    private readonly dataSource: DataSource,
    photoDir: string,
    private readonly now: () => number = Date.now,
  ) {
    this.dir = resolve(photoDir);
  }

  /** The absolute path of a stored file; refuses any name we would not have made. */
  private pathOf(fileName: string): string {
    if (!STORED_NAME.test(fileName)) throw new AppError("photo-file-invalid", "This photo's file name is not valid", 500);
    const path = join(this.dir, fileName);
    if (!path.startsWith(this.dir + sep)) throw new AppError("photo-file-invalid", "This photo's file name is not valid", 500);
    return path;
  }

  /** Checks the content and makes the stored image and its thumbnail (nothing is written yet). */
  private async prepare(file: UploadedFile, index: number): Promise<Prepared> {
    const which = `Photo ${index + 1}`;
    const sniffed = sniffImageFormat(file.buffer);
    if (!sniffed) {
      throw new AppError("not-an-image", `${which} is not a JPEG, PNG or WebP image (judged by its content, not its name)`, 415, [{ path: `${PHOTO_LIMITS.field}.${index}`, message: "Not an image we accept" }]);
    }
    let full: { data: Buffer; info: OutputInfo };
    try {
      const input = sharp(file.buffer, { failOn: "error", limitInputPixels: MAX_INPUT_PIXELS });
      const meta = await input.metadata();
      if (meta.format !== sniffed || !(PHOTO_LIMITS.formats as readonly string[]).includes(meta.format)) throw new Error(`format ${meta.format} does not match ${sniffed}`);
      full = await input
        .autoOrient()
        .resize({ width: PHOTO_LIMITS.storedMaxPx, height: PHOTO_LIMITS.storedMaxPx, fit: "inside", withoutEnlargement: true })
        .flatten({ background: "#ffffff" })
        .jpeg({ quality: 85, mozjpeg: true })
        .toBuffer({ resolveWithObject: true });
    } catch {
      throw new AppError("image-unreadable", `${which} could not be read as an image (damaged or incomplete?)`, 415, [{ path: `${PHOTO_LIMITS.field}.${index}`, message: "The image could not be read" }]);
    }
    const thumbnail = await sharp(full.data)
      .resize({ width: PHOTO_LIMITS.thumbnailMaxPx, height: PHOTO_LIMITS.thumbnailMaxPx, fit: "inside", withoutEnlargement: true })
      .jpeg({ quality: 75 })
      .toBuffer({ resolveWithObject: true });
    return {
      sha256: createHash("sha256").update(file.buffer).digest("hex"),
      full: { data: full.data, width: full.info.width, height: full.info.height },
      thumbnail: { data: thumbnail.data, width: thumbnail.info.width, height: thumbnail.info.height },
    };
  }

  /**
   * Stores the files as photos of an observation; all or nothing. An image already stored on the
   * observation (same bytes) is not stored again: its existing photo is in the answer.
   */
  async upload(observationId: number, files: UploadedFile[], actor: Principal): Promise<PhotoView[]> {
    const observation = await this.dataSource.getRepository(ObservationEntity).findOneBy({ id: observationId });
    if (!observation) throw notFound("observation-not-found", `There is no observation ${observationId}`);
    if (files.length === 0) {
      throw new AppError("no-photos", `Send multipart/form-data with the images in the field “${PHOTO_LIMITS.field}”`, 400, [{ path: PHOTO_LIMITS.field, message: "Attach at least one image" }]);
    }
    const prepared: Prepared[] = [];
    for (const [i, file] of files.entries()) prepared.push(await this.prepare(file, i));

    const repo = this.dataSource.getRepository(ObservationPhotoEntity);
    const existing = await repo.findBy({ observationId });
    const known = new Map(existing.map((p) => [p.sha256, p]));
    const fresh = prepared.filter((p, i) => !known.has(p.sha256) && prepared.findIndex((q) => q.sha256 === p.sha256) === i);
    if (existing.length + fresh.length > PHOTO_LIMITS.maxPerObservation) {
      throw new AppError("too-many-photos", `An observation holds at most ${PHOTO_LIMITS.maxPerObservation} photos; this one has ${existing.length}`, 409);
    }

    mkdirSync(this.dir, { recursive: true });
    const written: string[] = [];
    const uploadedAtMs = this.now();
    const name = await actorName(this.dataSource.manager, actor);
    try {
      const rows: Omit<ObservationPhotoRecord, "id">[] = [];
      for (const p of fresh) {
        const base = randomUUID();
        const fileName = `${base}.jpg`;
        const thumbnailFileName = `${base}-thumb.jpg`;
        // "wx": never overwrite anything; the names are new UUIDs.
        writeFileSync(this.pathOf(fileName), p.full.data, { flag: "wx" });
        written.push(fileName);
        writeFileSync(this.pathOf(thumbnailFileName), p.thumbnail.data, { flag: "wx" });
        written.push(thumbnailFileName);
        rows.push({
          observationId,
          fileName,
          thumbnailFileName,
          width: p.full.width,
          height: p.full.height,
          bytes: p.full.data.length,
          thumbnailWidth: p.thumbnail.width,
          thumbnailHeight: p.thumbnail.height,
          sha256: p.sha256,
          uploadedAtMs,
          uploadedByUserId: actor.userId,
          uploadedByName: name,
        });
      }
      if (rows.length > 0) await this.dataSource.transaction((tx) => tx.getRepository(ObservationPhotoEntity).insert(rows));
    } catch (err) {
      await Promise.all(written.map((f) => rm(this.pathOf(f), { force: true })));
      // Two retries of one upload at once: the other one stored it.
      if (!isUniqueViolation(err)) throw err;
    }
    const stored = await repo.findBy({ observationId, sha256: In(prepared.map((p) => p.sha256)) });
    const bySha = new Map(stored.map((p) => [p.sha256, p]));
    const ordered = [...new Set(prepared.map((p) => p.sha256))].map((sha) => bySha.get(sha)).filter((p): p is ObservationPhotoRecord => p !== undefined);
    return ordered.map(photoView);
  }

  async record(id: number): Promise<ObservationPhotoRecord> {
    const photo = await this.dataSource.getRepository(ObservationPhotoEntity).findOneBy({ id });
    if (!photo) throw notFound("photo-not-found", `There is no photo ${id}`);
    return photo;
  }

  /** The file to send for a photo or its thumbnail. */
  async file(id: number, variant: "full" | "thumbnail"): Promise<string> {
    const photo = await this.record(id);
    return this.pathOf(variant === "full" ? photo.fileName : photo.thumbnailFileName);
  }

  /** Photo views per observation, in upload order. */
  async viewsOf(observationIds: number[]): Promise<Map<number, PhotoView[]>> {
    const out = new Map<number, PhotoView[]>();
    if (observationIds.length === 0) return out;
    const rows = await this.dataSource.getRepository(ObservationPhotoEntity).find({ where: { observationId: In(observationIds) }, order: { id: "ASC" } });
    for (const r of rows) out.set(r.observationId, [...(out.get(r.observationId) ?? []), photoView(r)]);
    return out;
  }

  async delete(id: number): Promise<void> {
    const photo = await this.record(id);
    await this.dataSource.getRepository(ObservationPhotoEntity).delete({ id });
    await this.removeFiles([photo]);
  }

  /** Deletes the files of photos whose rows are gone (or going). Missing files are fine. */
  async removeFiles(photos: Pick<ObservationPhotoRecord, "fileName" | "thumbnailFileName">[]): Promise<void> {
    await Promise.all(photos.flatMap((p) => [rm(this.pathOf(p.fileName), { force: true }), rm(this.pathOf(p.thumbnailFileName), { force: true })]));
  }

  async photosOf(observationId: number): Promise<ObservationPhotoRecord[]> {
    return this.dataSource.getRepository(ObservationPhotoEntity).findBy({ observationId });
  }
}

export function photoView(p: ObservationPhotoRecord): PhotoView {
  return {
    id: p.id,
    observationId: p.observationId,
    url: `/api/photos/${p.id}`,
    thumbnailUrl: `/api/photos/${p.id}/thumbnail`,
    width: p.width,
    height: p.height,
    bytes: p.bytes,
    thumbnailWidth: p.thumbnailWidth,
    thumbnailHeight: p.thumbnailHeight,
    uploadedAtMs: p.uploadedAtMs,
    uploadedByName: p.uploadedByName,
  };
}
