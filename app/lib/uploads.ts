// The size cap on photos and tree images, one number for both sides: the phone checks it before
// sending a photo, the server refuses anything over it (upload.server.ts, storage.server.ts).
export const MAX_IMAGE_BYTES = 10 * 1024 * 1024;
export const MAX_IMAGE_MB = MAX_IMAGE_BYTES / 1024 / 1024;

/** What the technician reads when a photo is over the cap. */
export const TOO_LARGE_PHOTO = `The photo is larger than ${MAX_IMAGE_MB} MB. Take it again at a lower resolution.`;
