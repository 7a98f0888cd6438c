// The top-level heading of a screen where the walk stops (a root cause, the finished job, a hand
// over, a pause): a small line saying which, then what it is. Focus moves to it when the screen
// appears, as it does to a step's title.
export function EndHeading({
  kicker,
  title,
  tone = "text-ink-soft",
  caps = true,
}: {
  kicker: string;
  title: string;
  tone?: string;
  caps?: boolean;
}) {
  return (
    <h1 id="step-title" tabIndex={-1} className="outline-none">
      <span className={`block text-base ${caps ? "font-semibold uppercase tracking-wide" : ""} ${tone}`}>{kicker}</span>
      {title && <span className="block text-2xl font-bold leading-tight text-ink">{title}</span>}
    </h1>
  );
}
