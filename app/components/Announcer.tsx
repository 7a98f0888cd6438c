// Screen-reader announcements of what just happened ("Deleted ‘Check the fuse’", a refused
// entry). Two live regions that exist before anything is said (a region that appears together
// with its text is often not read); announce() empties the region and writes the text a moment
// later, so the same message said twice is read twice.
const POLITE = "announce-polite";
const ASSERTIVE = "announce-assertive";

export function Announcer() {
  return (
    <>
      <div id={POLITE} role="status" aria-live="polite" aria-atomic="true" className="sr-only" />
      <div id={ASSERTIVE} role="alert" aria-live="assertive" aria-atomic="true" className="sr-only" />
    </>
  );
}

export function announce(text: string, how: "polite" | "assertive" = "polite") {
  const el = typeof document === "undefined" ? null : document.getElementById(how === "polite" ? POLITE : ASSERTIVE);
  if (!el) return;
  el.textContent = "";
  setTimeout(() => {
    el.textContent = text;
  }, 60);
}
