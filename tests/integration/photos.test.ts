import { randomUUID } from "node:crypto";
import { existsSync, readdirSync, statSync } from "node:fs";
import { join, resolve } from "node:path";
import sharp from "sharp";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { problemSchema } from "../../shared/api-error.js";
import { addDays, localDate } from "../../shared/domain/batch-calendar.js";
import { PHOTO_LIMITS, batchResponseSchema, createObservationResponseSchema, observationResponseSchema, uploadPhotosResponseSchema } from "../../shared/schemas/batches.js";
import { layoutResponseSchema } from "../../shared/schemas/layout.js";
import { signIn, startTestServer, type TestServer } from "../support/test-server.js";

/** Photo uploads of observations (issue 6 §2): images only by content, size-limited, generated names, thumbnails, signed-in only. */
let server: TestServer;
let grower: string;
let observationId: number;
let photoDir: string;

const STORED_NAME = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}(-thumb)?\.jpg$/;

/** A 64×48 JPEG made here, with an EXIF orientation of 6 (the camera was turned: shown rotated 90°). */
async function cameraJpeg(colour = "#3a7d44"): Promise<Buffer> {
  return sharp({ create: { width: 64, height: 48, channels: 3, background: colour } })
    .jpeg({ quality: 90 })
    .withMetadata({ orientation: 6, exif: { IFD0: { Make: "Hollin Lane test camera", Copyright: "private" } } })
    .toBuffer();
}

/** Every file under a folder, recursively. */
function filesUnder(dir: string): string[] {
  if (!existsSync(dir)) return [];
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    return statSync(path).isDirectory() ? filesUnder(path) : [path];
  });
}

const upload = (token: string, id = observationId) => request(server.baseUrl).post(`/api/observations/${id}/photos`).auth(token, { type: "bearer" });

beforeAll(async () => {
  server = await startTestServer({ ALERT_TICK: "1h" });
  photoDir = join(server.dir, "photos");
  grower = await signIn(server, "grower");
  const layout = layoutResponseSchema.parse((await request(server.baseUrl).get("/api/layout").auth(grower, { type: "bearer" }).expect(200)).body);
  const stuckOn = addDays(localDate(Date.now(), "America/Chicago"), -7)!;
  const batch = batchResponseSchema.parse(
    (await request(server.baseUrl).post("/api/batches").auth(grower, { type: "bearer" }).send({ variety: "Harbour Amber", stuckOn, countStuck: 40, benchId: layout.benches[0]!.id }).expect(201)).body,
  ).batch;
  const created = createObservationResponseSchema.parse(
    (await request(server.baseUrl).post(`/api/batches/${batch.id}/observations`).auth(grower, { type: "bearer" }).send({ clientId: randomUUID(), stage: "callused" }).expect(201)).body,
  );
  observationId = created.observation.id;
});

afterAll(async () => {
  await server.cleanup();
});

describe("photo uploads", () => {
  it("when a text file is sent with an image name and type, then it is refused as not an image and nothing is stored", async () => {
    const res = await upload(grower).attach("photos", Buffer.from("these are not the pixels you are looking for\n"), { filename: "photo.jpg", contentType: "image/jpeg" }).expect(415);
    const problem = problemSchema.parse(res.body);
    expect(problem.code).toBe("not-an-image");
    expect(problem.detail).toMatch(/not a JPEG, PNG or WebP image/);
    expect(filesUnder(photoDir)).toEqual([]);
  });

  it("when an image is cut off after its header, then it is refused as unreadable", async () => {
    const whole = await cameraJpeg();
    const res = await upload(grower).attach("photos", whole.subarray(0, 40), { filename: "photo.jpg", contentType: "image/jpeg" }).expect(415);
    expect(problemSchema.parse(res.body).code).toBe("image-unreadable");
    expect(filesUnder(photoDir)).toEqual([]);
  });

  it("when a file is larger than the limit, then it is refused with 413", async () => {
    // A JPEG signature followed by padding: the size is refused before the content is looked at.
    const big = Buffer.alloc(PHOTO_LIMITS.maxBytes + 1, 0);
    big.set([0xff, 0xd8, 0xff, 0xe0]);
    const res = await upload(grower).attach("photos", big, { filename: "big.jpg", contentType: "image/jpeg" }).expect(413);
    const problem = problemSchema.parse(res.body);
    expect(problem.code).toBe("photo-too-large");
    expect(problem.detail).toContain("10 MB");
    expect(filesUnder(photoDir)).toEqual([]);
  });

  it("when the file name climbs out of the folder, then the photo is stored under a generated name inside data/ only", async () => {
    const evil = `evil-${randomUUID()}.jpg`;
    // form-data sends only the base name of a `filename`; a `filepath` goes out as given, so the climb reaches the server.
    const climbing = { filepath: `../../../../../../tmp/${evil}`, contentType: "image/jpeg" };
    const res = await upload(grower).attach("photos", await cameraJpeg("#884422"), climbing).expect(201);
    const { photos } = uploadPhotosResponseSchema.parse(res.body);
    expect(photos).toHaveLength(1);
    // Nothing at the place the name pointed to, nor beside the database, nor anywhere named like it.
    for (const place of [join("/tmp", evil), resolve(photoDir, "../../../../../../tmp", evil), join(server.dir, evil)]) expect(existsSync(place)).toBe(false);
    const stored = filesUnder(server.dir).filter((f) => !/benchwarden\.sqlite(-wal|-shm)?$/.test(f) && !f.endsWith("demo-sensors.json"));
    expect(stored.length).toBe(2);
    for (const f of stored) {
      expect(f.startsWith(photoDir + "/")).toBe(true);
      expect(f.slice(photoDir.length + 1)).toMatch(STORED_NAME);
    }
    expect(JSON.stringify(res.body)).not.toContain("evil");
  });

  it("when a valid camera photo is uploaded, then it is stored upright without metadata, with a thumbnail, and served only to signed-in users", async () => {
    const original = await cameraJpeg("#224488");
    expect((await sharp(original).metadata()).orientation).toBe(6);
    const res = await upload(grower).attach("photos", original, { filename: "IMG_0001.JPG", contentType: "image/jpeg" }).expect(201);
    const { photos, observation } = uploadPhotosResponseSchema.parse(res.body);
    const [photo] = photos;
    // Orientation 6 turns a 64×48 landscape sensor image into a 48×64 portrait (EXIF 2.3 Orientation tag).
    expect(photo).toMatchObject({ width: 48, height: 64, url: `/api/photos/${photo!.id}`, thumbnailUrl: `/api/photos/${photo!.id}/thumbnail` });
    expect(observation.photos.map((p) => p.id)).toContain(photo!.id);

    const full = await request(server.baseUrl).get(photo!.url).auth(grower, { type: "bearer" }).buffer(true).expect(200);
    expect(full.headers["content-type"]).toBe("image/jpeg");
    expect(full.headers["cache-control"]).toContain("private");
    const meta = await sharp(full.body as Buffer).metadata();
    expect(meta).toMatchObject({ format: "jpeg", width: 48, height: 64 });
    expect(meta.orientation).toBeUndefined();
    expect(meta.exif).toBeUndefined();

    const viewer = await signIn(server, "viewer");
    const thumb = await request(server.baseUrl).get(photo!.thumbnailUrl).auth(viewer, { type: "bearer" }).buffer(true).expect(200);
    const thumbMeta = await sharp(thumb.body as Buffer).metadata();
    expect(thumbMeta.format).toBe("jpeg");
    expect(Math.max(thumbMeta.width!, thumbMeta.height!)).toBeLessThanOrEqual(PHOTO_LIMITS.thumbnailMaxPx);

    for (const path of [photo!.url, photo!.thumbnailUrl]) {
      const signedOut = await request(server.baseUrl).get(path).expect(401);
      expect(problemSchema.parse(signedOut.body).code).toBe("sign-in-required");
      expect(signedOut.headers["content-type"]).not.toContain("image");
    }
  });

  it("when the same image is sent again (a retry), then it is stored once", async () => {
    const image = await cameraJpeg("#aa3355");
    const first = uploadPhotosResponseSchema.parse((await upload(grower).attach("photos", image, { filename: "a.jpg" }).expect(201)).body);
    const before = filesUnder(photoDir).length;
    const again = uploadPhotosResponseSchema.parse((await upload(grower).attach("photos", image, { filename: "b.jpg" }).expect(201)).body);
    expect(again.photos.map((p) => p.id)).toEqual(first.photos.map((p) => p.id));
    expect(filesUnder(photoDir).length).toBe(before);
  });

  it("a PNG is accepted whatever its name says; several photos go in one upload", async () => {
    const png = await sharp({ create: { width: 30, height: 20, channels: 4, background: { r: 10, g: 120, b: 40, alpha: 0.5 } } }).png().toBuffer();
    const webp = await sharp({ create: { width: 20, height: 30, channels: 3, background: "#777700" } }).webp().toBuffer();
    const res = await upload(grower)
      .attach("photos", png, { filename: "notes.txt", contentType: "text/plain" })
      .attach("photos", webp, { filename: "second", contentType: "application/octet-stream" })
      .expect(201);
    const { photos } = uploadPhotosResponseSchema.parse(res.body);
    expect(photos.map((p) => [p.width, p.height])).toEqual([
      [30, 20],
      [20, 30],
    ]);
  });

  it("more photos in one upload than allowed are refused; an upload without files says where to put them", async () => {
    const many = request(server.baseUrl).post(`/api/observations/${observationId}/photos`).auth(grower, { type: "bearer" });
    for (let i = 0; i <= PHOTO_LIMITS.maxPerUpload; i++) many.attach("photos", await cameraJpeg(`#0${i}0${i}0${i}`), { filename: `${i}.jpg` });
    expect(problemSchema.parse((await many.expect(413)).body).code).toBe("too-many-photos");
    const none = await upload(grower).field("note", "no files").expect(400);
    expect(problemSchema.parse(none.body).code).toBe("no-photos");
  });

  it("a viewer may look but not upload; a deleted photo's files are gone", async () => {
    const viewer = await signIn(server, "viewer");
    await upload(viewer).attach("photos", await cameraJpeg(), { filename: "x.jpg" }).expect(403);
    const { photos } = uploadPhotosResponseSchema.parse((await upload(grower).attach("photos", await cameraJpeg("#101010"), { filename: "x.jpg" }).expect(201)).body);
    const before = filesUnder(photoDir).length;
    await request(server.baseUrl).delete(`/api/photos/${photos[0]!.id}`).auth(grower, { type: "bearer" }).expect(204);
    expect(filesUnder(photoDir).length).toBe(before - 2);
    await request(server.baseUrl).get(photos[0]!.url).auth(grower, { type: "bearer" }).expect(404);
    const observation = observationResponseSchema.parse((await request(server.baseUrl).get(`/api/observations/${observationId}`).auth(viewer, { type: "bearer" }).expect(200)).body).observation;
    expect(observation.photos.map((p) => p.id)).not.toContain(photos[0]!.id);
  });
});
