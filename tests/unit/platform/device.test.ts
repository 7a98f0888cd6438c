// What the session list says about a browser, from its User-Agent. The strings are the published
// formats of each browser (from memory: Chrome on Android, Safari on iPhone, Firefox on Windows).
import { describe, expect, it } from "vitest";
import { describeDevice } from "../../../app/lib/device";

describe("describeDevice", () => {
  it("names the browser, the system and a phone or tablet", () => {
    expect(
      describeDevice(
        "Mozilla/5.0 (Linux; Android 14; Pixel 8) AppleWebKit/537.36 (KHTML, like Gecko) Chrome/126.0.0.0 Mobile Safari/537.36",
      ),
    ).toBe("Chrome on Android phone");
    expect(
      describeDevice(
        "Mozilla/5.0 (iPhone; CPU iPhone OS 17_5 like Mac OS X) AppleWebKit/605.1.15 (KHTML, like Gecko) Version/17.5 Mobile/15E148 Safari/604.1",
      ),
    ).toBe("Safari on iOS phone");
    expect(
      describeDevice(
        "Mozilla/5.0 (iPad; CPU OS 17_5 like Mac OS X) AppleWebKit/605.1.15 (KHTML, like Gecko) Version/17.5 Mobile/15E148 Safari/604.1",
      ),
    ).toBe("Safari on iOS tablet");
    expect(describeDevice("Mozilla/5.0 (Windows NT 10.0; Win64; x64; rv:128.0) Gecko/20100101 Firefox/128.0")).toBe("Firefox on Windows");
  });
  it("says so when it cannot tell", () => {
    expect(describeDevice(null)).toBe("Unknown browser");
    expect(describeDevice("")).toBe("Unknown browser");
    expect(describeDevice("curl/8.5.0")).toBe("Unknown browser");
  });
});
