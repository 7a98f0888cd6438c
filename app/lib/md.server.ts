// Markdown → the safe block subset in ./md (server side only: the parser stays off the phone).
import type { BlockContent, DefinitionContent, ListItem, PhrasingContent, RootContent } from "mdast";
import { fromMarkdown } from "mdast-util-from-markdown";
import { safeUrl, type MdBlock, type MdInline } from "./md";

function inline(nodes: PhrasingContent[]): MdInline[] {
  const out: MdInline[] = [];
  for (const n of nodes) {
    switch (n.type) {
      case "text":
        out.push({ t: "text", v: n.value });
        break;
      case "strong":
        out.push({ t: "strong", c: inline(n.children) });
        break;
      case "emphasis":
        out.push({ t: "em", c: inline(n.children) });
        break;
      case "delete":
        out.push({ t: "del", c: inline(n.children) });
        break;
      case "inlineCode":
        out.push({ t: "code", v: n.value });
        break;
      case "break":
        out.push({ t: "br" });
        break;
      case "link": {
        const href = safeUrl(n.url);
        if (href) out.push({ t: "link", href, c: inline(n.children) });
        else out.push(...inline(n.children));
        break;
      }
      case "image": {
        const src = safeUrl(n.url);
        out.push(src ? { t: "img", src, alt: n.alt ?? "" } : { t: "text", v: n.alt ?? "" });
        break;
      }
      default:
        if ("value" in n && typeof n.value === "string") out.push({ t: "text", v: n.value });
        else if ("children" in n) out.push(...inline(n.children as PhrasingContent[]));
    }
  }
  return out;
}

function blocks(nodes: (RootContent | BlockContent | DefinitionContent | ListItem)[]): MdBlock[] {
  const out: MdBlock[] = [];
  for (const n of nodes) {
    switch (n.type) {
      case "paragraph":
        out.push({ t: "p", c: inline(n.children) });
        break;
      case "heading":
        out.push({ t: "h", level: n.depth, c: inline(n.children) });
        break;
      case "list":
        out.push({ t: "list", ordered: Boolean(n.ordered), items: n.children.map((item) => blocks(item.children)) });
        break;
      case "blockquote":
        out.push({ t: "quote", c: blocks(n.children) });
        break;
      case "code":
        out.push({ t: "pre", v: n.value });
        break;
      case "thematicBreak":
        out.push({ t: "hr" });
        break;
      case "html":
        out.push({ t: "p", c: [{ t: "text", v: n.value }] });
        break;
      default:
        break;
    }
  }
  return out;
}

export function markdownBlocks(source: string | undefined | null): MdBlock[] {
  if (!source?.trim()) return [];
  return blocks(fromMarkdown(source).children);
}
