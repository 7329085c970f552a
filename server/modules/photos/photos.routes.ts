import { Router, type RequestHandler } from "express";
import multer from "multer";
import { PHOTO_LIMITS, type UploadPhotosResponse } from "../../../shared/schemas/batches.js";
import { EVERYONE_SIGNED_IN, type RouteTable } from "../../lib/auth.js";
import { AppError } from "../../lib/errors.js";
import { BATCH_RECORDERS, idParams } from "../batches/batches.routes.js";
import type { ObservationsService } from "../observations/observations.service.js";
import type { PhotosService } from "./photos.service.js";

const MB = 1024 * 1024;

/**
 * multer in memory: nothing is written to disk until the content has been checked, and then only
 * under names we make (the client's file name is never used, so "../../x.jpg" goes nowhere).
 * Limits bound what one request can make us hold: 6 files of 10 MB.
 */
const upload = multer({
  storage: multer.memoryStorage(),
  limits: { fileSize: PHOTO_LIMITS.maxBytes, files: PHOTO_LIMITS.maxPerUpload, fields: 10, fieldSize: 4096, parts: PHOTO_LIMITS.maxPerUpload + 10, headerPairs: 200 },
}).array(PHOTO_LIMITS.field, PHOTO_LIMITS.maxPerUpload);

/** Runs multer and turns its errors (and busboy's) into problem details the tablet can show. */
const receivePhotos: RequestHandler = (req, res, next) => {
  upload(req, res, (err: unknown) => {
    if (!err) return next();
    if (err instanceof multer.MulterError) {
      switch (err.code) {
        case "LIMIT_FILE_SIZE":
          return next(new AppError("photo-too-large", `A photo may be at most ${PHOTO_LIMITS.maxBytes / MB} MB`, 413, [{ path: PHOTO_LIMITS.field, message: `At most ${PHOTO_LIMITS.maxBytes / MB} MB per photo` }]));
        case "LIMIT_FILE_COUNT":
          return next(new AppError("too-many-photos", `Send at most ${PHOTO_LIMITS.maxPerUpload} photos at a time`, 413, [{ path: PHOTO_LIMITS.field, message: `At most ${PHOTO_LIMITS.maxPerUpload} at a time` }]));
        case "LIMIT_UNEXPECTED_FILE":
          return next(
            err.field === PHOTO_LIMITS.field
              ? new AppError("too-many-photos", `Send at most ${PHOTO_LIMITS.maxPerUpload} photos at a time`, 413, [{ path: PHOTO_LIMITS.field, message: `At most ${PHOTO_LIMITS.maxPerUpload} at a time` }])
              : new AppError("unexpected-field", `Send the images in the field “${PHOTO_LIMITS.field}”`, 400),
          );
        default:
          return next(new AppError("upload-malformed", "The upload was not understood; send multipart/form-data", 400));
      }
    }
    // busboy: malformed or truncated multipart bodies.
    return next(new AppError("upload-malformed", "The upload was not understood or was cut off; try again", 400));
  });
};

/**
 * Photos of observations: uploaded by those who record observations, seen by every signed-in role.
 * Photo files are never public: they answer only with a session (cookie or bearer token).
 */
export function photosRoutes(table: RouteTable, photos: PhotosService, observations: ObservationsService): Router {
  const r = table.router("/api", Router());
  const id = (params: unknown) => idParams.parse(params).id;

  // The guard runs before multer, so nobody signed out makes us read a byte of an upload.
  r.post("/observations/:id/photos", BATCH_RECORDERS, receivePhotos, async (req, res) => {
    const observationId = id(req.params);
    const files = ((req.files as Express.Multer.File[] | undefined) ?? []).map((f) => ({ buffer: f.buffer, size: f.size }));
    const stored = await photos.upload(observationId, files, req.principal!);
    const body: UploadPhotosResponse = { photos: stored, observation: await observations.get(observationId) };
    res.status(201).json(body);
  });

  const send = (variant: "full" | "thumbnail"): RequestHandler =>
    async (req, res) => {
      const path = await photos.file(id(req.params), variant);
      res.setHeader("Cache-Control", "private, max-age=86400");
      res.type("image/jpeg");
      await new Promise<void>((resolve, reject) =>
        res.sendFile(path, { dotfiles: "deny", headers: { "Content-Disposition": "inline" } }, (err) => {
          if (!err) return resolve();
          if ((err as NodeJS.ErrnoException).code === "ENOENT") return reject(new AppError("photo-file-missing", "This photo's file is missing on the server", 404));
          reject(err);
        }),
      );
    };
  r.get("/photos/:id", EVERYONE_SIGNED_IN, send("full"));
  r.get("/photos/:id/thumbnail", EVERYONE_SIGNED_IN, send("thumbnail"));

  r.delete("/photos/:id", BATCH_RECORDERS, async (req, res) => {
    await photos.delete(id(req.params));
    res.status(204).end();
  });

  return r.router;
}
