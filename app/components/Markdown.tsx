// A step body (Markdown, as the author wrote it) rendered for reading. Raw HTML is skipped;
// react-markdown's default URL check drops javascript: links.
import ReactMarkdown from "react-markdown";

export function Markdown({ children }: { children: string }) {
  return (
    <div className="prose-body space-y-2 [&_a]:underline [&_img]:max-h-80 [&_img]:rounded-lg [&_img]:border [&_img]:border-rule [&_li]:ml-5 [&_ol]:list-decimal [&_ul]:list-disc">
      <ReactMarkdown skipHtml>{children}</ReactMarkdown>
    </div>
  );
}
