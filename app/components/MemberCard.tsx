// One member on the owner's People page: who they are, their role (changeable), and their access:
// turn it off (asked first: they are signed out at once) or back on, and a fresh start for their
// sign-in (their sessions end and they get a link to set a new password).
import { Form } from "react-router";
import { ROLE_LABEL, ROLES, type Role } from "~/lib/roles";
import { useAsk } from "./useAsk";

export type Member = { userId: string; name: string; email: string; role: Role; active: boolean; you: boolean };

export function MemberCard({ m, busy }: { m: Member; busy: boolean }) {
  const off = useAsk(!busy);
  const roleId = `role-${m.userId}`;
  return (
    <li className={`card space-y-3 ${m.active ? "" : "border-dashed bg-paper"}`}>
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <p className="min-w-0">
          <span className="font-semibold">{m.name}</span>
          {m.you && <span className="text-ink-soft"> (you)</span>} <span className="break-all text-ink-soft">{m.email}</span>
        </p>
        <p className="font-semibold">
          {ROLE_LABEL[m.role]}
          {!m.active && <span className="ml-2 rounded bg-out-soft px-2 py-0.5 text-base text-out">Access off</span>}
        </p>
      </div>
      <div className="flex flex-wrap items-end gap-3">
        <Form method="post" className="flex flex-wrap items-end gap-2">
          <input type="hidden" name="intent" value="role" />
          <input type="hidden" name="userId" value={m.userId} />
          <div>
            <label htmlFor={roleId} className="field-label text-base">
              Role of {m.name}
            </label>
            <select id={roleId} name="role" defaultValue={m.role} className="field-input min-h-11 w-44 text-base">
              {ROLES.map((r) => (
                <option key={r} value={r}>
                  {ROLE_LABEL[r]}
                </option>
              ))}
            </select>
          </div>
          <button className="btn-quiet min-h-11 text-base" disabled={busy}>
            Change role
          </button>
        </Form>
        {!m.you && m.active && (
          <Form method="post">
            <input type="hidden" name="intent" value="reset" />
            <input type="hidden" name="userId" value={m.userId} />
            <button className="btn-quiet min-h-11 text-base" disabled={busy}>
              Reset sign-in
            </button>
          </Form>
        )}
        {!m.you && m.active && !off.asking && (
          <button type="button" ref={off.asker} className="btn-quiet min-h-11 text-base text-out" onClick={() => off.setAsking(true)}>
            Turn off access…
          </button>
        )}
        {!m.active && (
          <Form method="post">
            <input type="hidden" name="intent" value="reactivate" />
            <input type="hidden" name="userId" value={m.userId} />
            <button className="btn-quiet min-h-11 text-base" disabled={busy}>
              Turn access back on
            </button>
          </Form>
        )}
      </div>
      {off.asking && (
        <Form method="post" className="space-y-2 rounded-lg border-2 border-out bg-out-soft p-3" onSubmit={() => off.setAsking(false)}>
          <input type="hidden" name="intent" value="deactivate" />
          <input type="hidden" name="userId" value={m.userId} />
          <p className="font-semibold text-out">Turn off {m.name}'s access?</p>
          <p>
            They are signed out at once and can't sign in to this shop until you turn it back on. Their runs, reports and calls stay as they
            are.
          </p>
          <p className="flex flex-wrap gap-2">
            <button ref={off.answer} className="btn min-h-11 bg-out text-base text-white" disabled={busy}>
              Turn off access
            </button>
            <button type="button" className="btn-quiet min-h-11 text-base" onClick={() => off.setAsking(false)}>
              Keep access
            </button>
          </p>
        </Form>
      )}
    </li>
  );
}
