// The service report as an e-mail's HTML: the same ReportDocument as the page and print, with its
// stylesheet embedded and photos linked by cid:. Server only (route actions pass it to sendReport).
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import type { ReportData } from "~/lib/report-data";
import { ReportDocument, REPORT_CSS } from "./ReportDocument";

const escape = (s: string) => s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;");

export function reportMailHtml(report: ReportData, photoSrc: (id: string) => string, note: string | null): string {
  const body = renderToStaticMarkup(createElement(ReportDocument, { report, photoSrc }));
  const after = note ? `<p style="font-family:Arial,sans-serif;color:#4a5361">${escape(note)}</p>` : "";
  return `<!doctype html><html><head><meta charset="utf-8"><style>${REPORT_CSS}</style></head><body>${body}${after}</body></html>`;
}
