// /outbox — what the shop has e-mailed (service reports, invitations), as the local mail catcher
// received it (demo and test setups), each report linked to its page. Owners and leads.
import { requireUser } from "~/lib/auth.server";
import { atShop } from "~/lib/display";
import { page } from "~/lib/route.server";
import { listOutbox } from "~/models/outbox.server";
import { shopTimeZone } from "~/models/shop.server";
import type { Route } from "./+types/outbox";

export const meta: Route.MetaFunction = () => [{ title: "Outbox · Cluepath" }];

export const loader = page(async ({ request }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const [outbox, tz] = await Promise.all([listOutbox(ctx), shopTimeZone(ctx)]);
  return { ...outbox, tz };
});

export default function Outbox({ loaderData }: Route.ComponentProps) {
  const { enabled, messages } = loaderData;
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-bold">Outbox</h1>
      {!enabled ? (
        <p className="card">
          Cluepath hands the shop's mail to your mail server, which keeps the sent copies: look for them there. This list is kept only on
          demo and test setups.
        </p>
      ) : (
        <p className="text-ink-soft">What Cluepath has e-mailed for your shop, newest first.</p>
      )}
      {enabled && messages.length === 0 && <p className="card">Nothing sent yet.</p>}
      <ul className="space-y-3">
        {messages.map((m) => (
          <li key={m.id} className="card">
            <details>
              <summary className="cursor-pointer list-none">
                <p className="text-lg font-semibold">{m.subject || "(no subject)"}</p>
                <p className="text-ink-soft">
                  To {m.to.join(", ")} · {atShop(m.receivedAt, loaderData.tz)}
                  {m.attachments.length > 0 ? ` · ${m.attachments.length} attachment${m.attachments.length === 1 ? "" : "s"}` : ""}
                </p>
                <p className="mt-1 flex min-h-11 items-center text-base font-semibold text-copper-dark underline">Show the message</p>
              </summary>
              <pre className="mt-3 overflow-x-auto whitespace-pre-wrap rounded-lg bg-paper p-3 font-sans text-base">{m.text}</pre>
              {m.attachments.length > 0 && (
                <ul className="mt-2 text-ink-soft">
                  {m.attachments.map((a, i) => (
                    <li key={i}>
                      {a.filename} ({a.contentType}, {Math.ceil(a.size / 1024)} KB)
                    </li>
                  ))}
                </ul>
              )}
            </details>
            {m.reportId && (
              <a href={`/reports/${m.reportId}`} className="tap font-semibold">
                Open the report
              </a>
            )}
          </li>
        ))}
      </ul>
    </div>
  );
}
