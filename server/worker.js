/* global __PRECACHE__ */
// Cluepath's service worker (served as /sw.js by server/service-worker.ts, which fills in the
// version and the files to keep). It keeps the app's code and two empty page shells on the phone,
// nothing of any user's: no calls, runs or photos pass through its caches (they live in the page's
// per-user IndexedDB, which sign-out deletes).
//
//   install   caches the runner's and the technician's code, styles, fonts and icons, and the empty
//             shells of /runs/:id and /phone (asked for with the shell header: no user, no data);
//             the first install takes over at once, an update waits until the page says "reload".
//   fetch     pages: the network first; with no answer (or a server error) the runner's and the
//             phone page's shells, and /phone for any other page. Hashed assets: the cache first.
//             API calls and page data: always the network (the page keeps its own copy).
//   activate  drops the caches of older versions.
const VERSION = "__VERSION__";
const PRECACHE = __PRECACHE__;
const SHELL_HEADER = "__SHELL_HEADER__";
const CACHE = `cluepath-app-${VERSION}`;
const SHELLS = { runner: "/runs/_shell", phone: "/phone" };
/** With no answer in this long, a page that has a shell opens from it (a basement with one bar). */
const PAGE_TIMEOUT_MS = 6000;
const keep = new Set(PRECACHE);

self.addEventListener("install", (event) => {
  event.waitUntil(
    (async () => {
      const cache = await caches.open(CACHE);
      await cache.addAll(PRECACHE.map((url) => new Request(url, { cache: "reload" })));
      for (const [name, url] of Object.entries(SHELLS)) {
        const res = await fetch(url, { headers: { [SHELL_HEADER]: "1" }, credentials: "omit", cache: "no-store" });
        if (!res.ok) throw new Error(`the ${name} shell answered ${res.status}`);
        await cache.put(`/__shell/${name}`, res);
      }
      if (!self.registration.active) await self.skipWaiting();
    })(),
  );
});

self.addEventListener("activate", (event) => {
  event.waitUntil(
    (async () => {
      for (const key of await caches.keys()) if (key.startsWith("cluepath-app-") && key !== CACHE) await caches.delete(key);
      await self.clients.claim();
    })(),
  );
});

self.addEventListener("message", (event) => {
  if (event.data && event.data.type === "skip-waiting") void self.skipWaiting();
});

self.addEventListener("fetch", (event) => {
  const req = event.request;
  if (req.method !== "GET") return;
  const url = new URL(req.url);
  if (url.origin !== self.location.origin) return;
  if (req.mode === "navigate") return event.respondWith(page(req, url));
  if (url.pathname.startsWith("/api/") || url.pathname.endsWith(".data") || url.pathname === "/sw.js") return;
  if (url.pathname.startsWith("/assets/") || keep.has(url.pathname)) event.respondWith(cacheFirst(req, url));
});

/** Which shell serves a page address, if any. */
function shellOf(pathname) {
  if (/^\/runs\/[^/]+\/?$/.test(pathname)) return "runner";
  if (pathname === "/phone") return "phone";
  return null;
}

async function page(req, url) {
  const shell = shellOf(url.pathname);
  try {
    const res = await (shell ? withTimeout(fetch(req), PAGE_TIMEOUT_MS) : fetch(req));
    if (shell && res.status >= 500) return (await fromCache(`/__shell/${shell}`)) ?? res;
    return res;
  } catch {
    if (shell) {
      const hit = await fromCache(`/__shell/${shell}`);
      if (hit) return hit;
    }
    if (await fromCache("/__shell/phone")) return Response.redirect("/phone", 302);
    return Response.error();
  }
}

async function fromCache(key) {
  const cache = await caches.open(CACHE);
  return (await cache.match(key)) ?? null;
}

async function cacheFirst(req, url) {
  const cache = await caches.open(CACHE);
  const hit = await cache.match(req, { ignoreSearch: true });
  if (hit) return hit;
  const res = await fetch(req);
  if (res.ok && url.pathname.startsWith("/assets/")) await cache.put(req, res.clone());
  return res;
}

function withTimeout(promise, ms) {
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error("timeout")), ms);
    promise.then(
      (v) => {
        clearTimeout(timer);
        resolve(v);
      },
      (e) => {
        clearTimeout(timer);
        reject(e);
      },
    );
  });
}
