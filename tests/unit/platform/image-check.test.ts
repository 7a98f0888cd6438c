import { describe, expect, it } from "vitest";
import { checkImage } from "../../../app/lib/storage.server";
import { MAX_IMAGE_BYTES } from "../../../app/lib/uploads";

// Signatures: PNG 89 50 4E 47 0D 0A 1A 0A (PNG spec, ISO/IEC 15948 §5.2); JPEG starts FF D8 FF
// (JFIF / ISO/IEC 10918-1 SOI marker); GIF starts "GIF87a" or "GIF89a" (GIF89a spec, §17).
const png = Buffer.from(
  "89504e470d0a1a0a0000000d49484452000000010000000108060000001f15c4890000000d49444154789c6360000002000154a24f5d0000000049454e44ae426082",
  "hex",
);
const gif = Buffer.concat([
  Buffer.from("GIF89a"),
  Buffer.from("01000100800000ffffff00000021f90401000000002c00000000010001000002024401003b", "hex"),
]);

describe("uploaded images are judged by their content", () => {
  it("accepts a real PNG and a real GIF whatever they are called", async () => {
    expect(await checkImage(png)).toEqual({ mime: "image/png", ext: "png" });
    expect(await checkImage(gif)).toMatchObject({ mime: "image/gif" });
  });
  it("refuses text, a fake GIF signature, and an empty file", async () => {
    await expect(checkImage(Buffer.from("<html>not a photo</html>"))).rejects.toMatchObject({ kind: "wrong-type", status: 415 });
    await expect(checkImage(Buffer.from("GIF? no, just text"))).rejects.toMatchObject({ kind: "wrong-type", status: 415 });
    await expect(checkImage(new Uint8Array())).rejects.toMatchObject({ kind: "invalid", status: 400 });
  });
  it("refuses anything over the 10 MB cap before looking further", async () => {
    // 10 MB: the cap DEVELOPERS.md states for uploads (Decisions, "Uploads").
    expect(MAX_IMAGE_BYTES).toBe(10 * 1024 * 1024);
    const big = new Uint8Array(MAX_IMAGE_BYTES + 1);
    big.set(png);
    await expect(checkImage(big)).rejects.toMatchObject({ kind: "too-large", status: 413 });
    const atCap = new Uint8Array(MAX_IMAGE_BYTES);
    atCap.set(png);
    expect(await checkImage(atCap)).toMatchObject({ mime: "image/png" });
  });
});
