// A run that cannot go on here: abandoned, or a procedure with no step to start from.
export function Closed({ title, detail }: { title: string; detail: string }) {
  return (
    <section className="card space-y-2">
      <h1 id="step-title" tabIndex={-1} className="text-2xl font-bold outline-none">
        {title}
      </h1>
      <p className="text-lg">{detail}</p>
      <a className="btn-quiet min-h-14 w-full" href="/">
        Back to my home
      </a>
    </section>
  );
}
