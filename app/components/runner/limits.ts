// The photo cap the phone checks before uploading; the server's MAX_IMAGE_BYTES is the rule
// (a unit test keeps the two equal).
export const MAX_PHOTO_MB = 10;
