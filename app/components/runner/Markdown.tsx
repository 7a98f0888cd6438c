// Renders the safe Markdown blocks the server sends (see lib/md.ts) as React elements.
import type { ReactNode } from "react";
import type { MdBlock, MdInline } from "~/lib/md";

function inline(nodes: MdInline[]): ReactNode[] {
  return nodes.map((n, i) => {
    switch (n.t) {
      case "text":
        return n.v;
      case "strong":
        return <strong key={i}>{inline(n.c)}</strong>;
      case "em":
        return <em key={i}>{inline(n.c)}</em>;
      case "del":
        return <del key={i}>{inline(n.c)}</del>;
      case "code":
        return (
          <code key={i} className="rounded bg-paper px-1">
            {n.v}
          </code>
        );
      case "br":
        return <br key={i} />;
      case "link":
        return (
          <a key={i} href={n.href} target="_blank" rel="noreferrer">
            {inline(n.c)}
          </a>
        );
      case "img":
        return <img key={i} src={n.src} alt={n.alt} loading="lazy" className="my-2 max-h-72 w-auto rounded-lg border border-rule" />;
    }
  });
}

function block(b: MdBlock, i: number): ReactNode {
  switch (b.t) {
    case "p":
      return <p key={i}>{inline(b.c)}</p>;
    case "h":
      return (
        <p key={i} className="font-bold">
          {inline(b.c)}
        </p>
      );
    case "list": {
      const items = b.items.map((item, j) => <li key={j}>{item.map(block)}</li>);
      return b.ordered ? (
        <ol key={i} className="list-decimal space-y-1 pl-6">
          {items}
        </ol>
      ) : (
        <ul key={i} className="list-disc space-y-1 pl-6">
          {items}
        </ul>
      );
    }
    case "quote":
      return (
        <blockquote key={i} className="border-l-4 border-rule pl-3 text-ink-soft">
          {b.c.map(block)}
        </blockquote>
      );
    case "pre":
      return (
        <pre key={i} className="overflow-x-auto rounded-lg bg-paper p-3 text-base">
          {b.v}
        </pre>
      );
    case "hr":
      return <hr key={i} className="border-rule" />;
  }
}

export function Markdown({ blocks, className }: { blocks: MdBlock[] | undefined; className?: string }) {
  if (!blocks?.length) return null;
  return <div className={`space-y-3 ${className ?? ""}`}>{blocks.map(block)}</div>;
}
