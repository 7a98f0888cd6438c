// Sending a report that was already e-mailed: a quiet button that asks first ("They already have
// it"), so a customer is not mailed twice by a stray tap. Used by the runner's finished screen and
// the report page. The question closes when the send it started has finished.
import { useEffect, useRef } from "react";
import { useAsk } from "~/components/useAsk";

export function SendAgain({
  contact,
  pending,
  send,
  className = "",
}: {
  contact: string;
  pending: boolean;
  send: () => void;
  className?: string;
}) {
  const { asking, setAsking, asker, answer } = useAsk();
  const wasPending = useRef(false);
  useEffect(() => {
    if (wasPending.current && !pending) setAsking(false);
    wasPending.current = pending;
  }, [pending, setAsking]);

  if (!asking)
    return (
      <button ref={asker} type="button" className={`btn-quiet min-h-14 ${className}`} onClick={() => setAsking(true)}>
        Send it again…
      </button>
    );
  return (
    <div role="group" aria-labelledby="send-again-q" className={`space-y-2 rounded-lg border-2 border-ink bg-card p-3 ${className}`}>
      <p id="send-again-q" className="text-lg font-semibold">
        Send the report to {contact} again? They already have it.
      </p>
      <div className="flex gap-2">
        <button ref={answer} type="button" className="btn-quiet min-h-14 flex-1 border-2 border-ink" disabled={pending} onClick={send}>
          {pending ? "Sending…" : "Send again"}
        </button>
        <button type="button" className="btn-quiet min-h-14 flex-1" onClick={() => setAsking(false)}>
          No
        </button>
      </div>
    </div>
  );
}
