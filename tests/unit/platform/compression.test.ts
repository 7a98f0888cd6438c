// Compressed answers (server/compression.ts): Accept-Encoding as RFC 9110 §12.5.3 reads it, which
// answers are worth compressing, and that a streamed body reaches the client as it is written.
import { PassThrough } from "node:stream";
import { brotliCompressSync, brotliDecompressSync, constants, gunzipSync } from "node:zlib";
import { describe, expect, it } from "vitest";
import { compressible, compressionStages, negotiateEncoding, varyOnEncoding } from "../../../server/compression";

describe("negotiateEncoding (RFC 9110 §12.5.3)", () => {
  it("reads the RFC's own examples", () => {
    // The examples listed in §12.5.3.
    expect(negotiateEncoding("compress, gzip")).toBe("gzip");
    expect(negotiateEncoding("")).toBeNull();
    expect(negotiateEncoding("*")).toBe("br");
    expect(negotiateEncoding("compress;q=0.5, gzip;q=1.0")).toBe("gzip");
    expect(negotiateEncoding("gzip;q=1.0, identity; q=0.5, *;q=0")).toBe("gzip");
  });

  it("prefers brotli at equal weight, follows the weights otherwise, and never sends what q=0 refuses", () => {
    // What browsers send (common practice): Chromium over HTTPS, and over plain HTTP (no br).
    expect(negotiateEncoding("gzip, deflate, br, zstd")).toBe("br");
    expect(negotiateEncoding("gzip, deflate")).toBe("gzip");
    expect(negotiateEncoding("gzip;q=0.5, br;q=0.4")).toBe("gzip");
    expect(negotiateEncoding("br;q=0, gzip")).toBe("gzip");
    expect(negotiateEncoding("BR, GZIP;Q=0")).toBe("br");
    expect(negotiateEncoding("identity")).toBeNull();
    expect(negotiateEncoding("gzip;q=0, br;q=0, *")).toBeNull();
    expect(negotiateEncoding(null)).toBeNull();
  });
});

describe("compressible", () => {
  const h = (init: Record<string, string>) => new Headers(init);
  it("takes text answers of unknown or at least 1 KB length", () => {
    expect(compressible(h({ "content-type": "text/html; charset=utf-8" }), 200)).toBe(true);
    expect(compressible(h({ "content-type": "application/json", "content-length": "32000" }), 200)).toBe(true);
    expect(compressible(h({ "content-type": "text/x-script" }), 200)).toBe(true); // React Router's .data answers
    expect(compressible(h({ "content-type": "application/json", "content-length": "40" }), 404)).toBe(false);
  });
  it("leaves alone images, encoded bodies, no-transform and bodiless statuses", () => {
    expect(compressible(h({ "content-type": "image/jpeg" }), 200)).toBe(false);
    expect(compressible(h({ "content-type": "text/html", "content-encoding": "gzip" }), 200)).toBe(false);
    expect(compressible(h({ "content-type": "text/html", "cache-control": "private, no-transform" }), 200)).toBe(false);
    expect(compressible(h({ "content-type": "text/html" }), 304)).toBe(false);
    expect(compressible(h({}), 200)).toBe(false);
  });
  it("adds Accept-Encoding to Vary once", () => {
    expect(varyOnEncoding(null)).toBe("accept-encoding");
    expect(varyOnEncoding("Cookie")).toBe("Cookie, accept-encoding");
    expect(varyOnEncoding("cookie, Accept-Encoding")).toBe("cookie, Accept-Encoding");
    expect(varyOnEncoding("*")).toBe("*");
  });
});

describe("compressionStages", () => {
  /** Waits (up to 2 s; zlib works on the thread pool) until `f` holds. */
  async function until(f: () => boolean): Promise<boolean> {
    for (let i = 0; i < 200 && !f(); i++) await new Promise((r) => setTimeout(r, 10));
    return f();
  }
  for (const [encoding, inflate] of [
    ["gzip", (b: Buffer) => gunzipSync(b, { finishFlush: constants.Z_SYNC_FLUSH })],
    ["br", (b: Buffer) => brotliDecompressSync(b, { finishFlush: constants.BROTLI_OPERATION_FLUSH })],
  ] as const) {
    it(`${encoding}: what was written reaches the client before the body ends (streamed HTML keeps streaming)`, async () => {
      const source = new PassThrough();
      const [bursts, zip] = compressionStages(encoding);
      source.pipe(bursts).pipe(zip);
      const out: Buffer[] = [];
      zip.on("data", (d: Buffer) => out.push(d));
      source.write("<!DOCTYPE html><html><body><main>shell</main>");
      const shell = () => out.length > 0 && inflate(Buffer.concat(out)).toString() === "<!DOCTYPE html><html><body><main>shell</main>";
      expect(await until(shell)).toBe(true);
      const ended = new Promise((r) => zip.once("end", r));
      source.end("<script>late data</script></body></html>");
      await ended;
      expect(inflate(Buffer.concat(out)).toString()).toBe(
        "<!DOCTYPE html><html><body><main>shell</main><script>late data</script></body></html>",
      );
    });
  }

  it("a page written in many small chunks within one turn is compressed as one (as small as compressing it whole)", async () => {
    const page = Buffer.from(
      `<!DOCTYPE html><html><body>${Array.from({ length: 400 }, (_, i) => `<li class="step">Step ${i}: 208 V — within 191–218 V</li>`).join("")}</body></html>`,
    );
    const source = new PassThrough();
    const [bursts, zip] = compressionStages("br");
    source.pipe(bursts).pipe(zip);
    const out: Buffer[] = [];
    zip.on("data", (d: Buffer) => out.push(d));
    const ended = new Promise((r) => zip.once("end", r));
    for (let i = 0; i < page.length; i += 500) source.write(page.subarray(i, i + 500));
    source.end();
    await ended;
    const streamed = Buffer.concat(out);
    expect(brotliDecompressSync(streamed).equals(page)).toBe(true);
    const whole = brotliCompressSync(page, { params: { [constants.BROTLI_PARAM_QUALITY]: 1 } });
    expect(streamed.length).toBeLessThanOrEqual(whole.length * 1.05);
  });
});
