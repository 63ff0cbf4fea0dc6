// The file a request carried, in the shape services take: multer's types stay in the route layer
// (server/middleware/upload.ts builds it).

/** The file a multipart request carried, as handed to services (no multer types below the route layer). */
export type UploadedFile = {
  /** The client's file name (never used as a path). */
  originalName: string;
  /** The Content-Type the client declared for the part. */
  declaredMime: string;
  bytes: Buffer;
};
