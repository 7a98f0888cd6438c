// "Chrome on Android phone": what a session list says about the browser that signed in, from its
// User-Agent (bowser's parser). Pure, so a unit test can read it against known strings.
import Bowser from "bowser";

export function describeDevice(userAgent: string | null | undefined): string {
  if (!userAgent) return "Unknown browser";
  const parsed = Bowser.parse(userAgent);
  const browser = parsed.browser.name || "Unknown browser";
  const os = parsed.os.name;
  const kind = parsed.platform.type === "mobile" ? "phone" : parsed.platform.type === "tablet" ? "tablet" : undefined;
  if (!os) return browser;
  return kind ? `${browser} on ${os} ${kind}` : `${browser} on ${os}`;
}
