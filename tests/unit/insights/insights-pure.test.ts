// The pure parts of owner insights: CSV writing (RFC 4180 quoting, OWASP CSV-injection
// neutralising), percentiles (against mathjs, a general-purpose library), the shop-calendar
// periods across a daylight-saving change, and the found-here sentences.
import { quantileSeq } from "mathjs";
import { describe, expect, it } from "vitest";
import { causeSentence, stepSentence, type FoundHere } from "../../../app/lib/insights/found-here";
import { filtersQuery, parseFilters } from "../../../app/lib/insights/filters";
import { percentile } from "../../../app/lib/insights/stats";
import { neutralise, toCsv, type Table } from "../../../app/lib/insights/table";
import { resolveScope } from "../../../app/lib/insights/period";

describe("CSV", () => {
  it("neutralises cells a spreadsheet would run as a formula (OWASP: = + - @ tab CR)", () => {
    for (const bad of ["=1+2", "+1-800", "-2+3", "@SUM(A1)", "\tx", "\rx"]) expect(neutralise(bad)).toBe(`'${bad}`);
    for (const fine of ["Fan wheel", "1.5 µF", "a=b", " =x"]) expect(neutralise(fine)).toBe(fine);
  });

  it("quotes fields with commas, quotes and line breaks and doubles quotes (RFC 4180 §2)", () => {
    const table: Table = {
      id: "parts",
      title: "Parts used",
      caption: "",
      columns: [
        { key: "d", label: "Part", kind: "text" },
        { key: "q", label: "Quantity", kind: "count" },
        { key: "s", label: "Share", kind: "percent" },
      ],
      rows: [
        { d: 'Capacitor, 1.5 µF "370 V"', q: 2, s: 0.125 },
        { d: '=HYPERLINK("x")', q: 1, s: null },
        { d: "two\nlines", q: 0, s: 1 },
      ],
    };
    expect(toCsv(table)).toBe(
      'Part,Quantity,Share\r\n"Capacitor, 1.5 µF ""370 V""",2,12.5 %\r\n"\'=HYPERLINK(""x"")",1,\r\n"two\nlines",0,100.0 %\r\n',
    );
  });
});

describe("percentiles", () => {
  it("interpolate between closest ranks like PERCENTILE.INC, matching mathjs.quantileSeq", () => {
    expect(percentile([1, 2, 3, 4], 0.5)).toBe(2.5);
    expect(percentile([7], 0.9)).toBe(7);
    expect(percentile([], 0.5)).toBeNull();
    const values = [3, 8, 8, 11, 19, 24, 36, 41, 52, 90, 120];
    for (const p of [0, 0.1, 0.25, 0.5, 0.9, 0.95, 1]) expect(percentile(values, p)).toBeCloseTo(quantileSeq(values, p) as number, 10);
  });
});

describe("periods in the shop's calendar", () => {
  const tz = "America/Chicago";
  it("last 30 days ending on a day after daylight time ended start at local midnight (UTC−5 then, UTC−6 now)", () => {
    const s = resolveScope("shop", { period: "30" }, tz, new Date("2026-11-30T18:00:00Z"));
    // US daylight time ends on the first Sunday of November (1 Nov 2026): midnight on 1 Nov is still CDT.
    expect(s.start.toISOString()).toBe("2026-11-01T05:00:00.000Z");
    expect(s.end.toISOString()).toBe("2026-12-01T06:00:00.000Z");
    expect([s.firstDay, s.lastDay]).toEqual(["2026-11-01", "2026-11-30"]);
    expect(s.months.map((m) => m.label)).toEqual(["Nov 2026"]);
  });
  it("a date range includes both days, and its months are listed in order", () => {
    const s = resolveScope("shop", { period: "range", from: "2026-02-27", to: "2026-04-02" }, tz);
    expect(s.start.toISOString()).toBe("2026-02-27T06:00:00.000Z");
    // Daylight time began 8 March 2026: 3 April starts at 05:00 UTC.
    expect(s.end.toISOString()).toBe("2026-04-03T05:00:00.000Z");
    expect(s.months.map((m) => m.key)).toEqual(["2026-02", "2026-03", "2026-04"]);
  });
  it("the URL round-trips, defaults left out", () => {
    const q = "period=range&from=2026-02-27&to=2026-04-02&category=fryer&make=Quellmark";
    const { filters } = parseFilters(new URLSearchParams(q));
    expect(filtersQuery(filters)).toBe(`?${q}`);
    expect(filtersQuery(parseFilters(new URLSearchParams("")).filters)).toBe("");
  });
});

describe("found-here sentences", () => {
  const found: FoundHere = {
    threshold: 10,
    treeRuns: 41,
    shown: true,
    steps: [
      {
        node: "fans",
        runs: 41,
        branches: [
          { branch: "answer:one slow, one stopped", label: "one slow, one stopped", runs: 27 },
          { branch: "answer:both stopped", label: "both stopped", runs: 9 },
          { branch: "answer:both at full speed", label: "both at full speed", runs: 5 },
        ],
      },
    ],
    causes: { make: "Vantor", model: "RCF-2208", runs: 31, shown: true, outcomes: [{ node: "cap-failed", runs: 14 }] },
  };
  it("reads as the issue asks", () => {
    expect(stepSentence(found.steps[0]!)).toBe(
      "41 earlier runs at this step: 27 one slow, one stopped · 9 both stopped · 5 both at full speed",
    );
    expect(causeSentence(found, "cap-failed")).toBe("Found in 14 of 31 completed runs of this tree on Vantor RCF-2208");
    expect(causeSentence(found, "motor-seized")).toBe("Found in 0 of 31 completed runs of this tree on Vantor RCF-2208");
    expect(causeSentence({ ...found, causes: { ...found.causes!, shown: false } }, "cap-failed")).toBeNull();
  });
});
