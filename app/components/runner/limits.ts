// The photo cap the phone checks before uploading: the same number the server refuses beyond.
export { MAX_IMAGE_MB as MAX_PHOTO_MB } from "~/lib/uploads";
