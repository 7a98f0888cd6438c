// The service report as data: what the page, the print view and the e-mail all show.
import type { VerdictKind } from "../engine/types";

export interface ReportReading {
  seq: number;
  title: string;
  reading: string;
  /** The technician confirmed it when asked whether an implausible reading was right. */
  confirmed: boolean;
  verdict: VerdictKind | null;
  limits: string | null;
  derivation: string | null;
  meter: string | null;
  at: string;
}

export interface ReportData {
  id: string;
  number: number;
  createdAt: string;
  sentTo: string | null;
  sentAt: string | null;
  shop: { name: string; town: string; footer: string | null; timeZone: string };
  call: { number: number; symptom: string; openedAt: string } | null;
  unit: { make: string; model: string; serial: string; category: string; installedOn: string | null } | null;
  site: { name: string; address: string; contactName: string; contactEmail: string } | null;
  customer: string | null;
  technician: string;
  procedure: { title: string; version: number | null };
  startedAt: string;
  completedAt: string | null;
  rootCause: string | null;
  remedy: string | null;
  actionTaken: string | null;
  minutesOnJob: number | null;
  readings: ReportReading[];
  nameplate: { title: string; value: string }[];
  checks: { title: string; answer: string }[];
  cautions: { title: string; hazard: string | null }[];
  notes: { step: string; text: string; author: string }[];
  photos: { id: string; step: string }[];
  parts: { partNumber: string; description: string; quantity: number }[];
}

export const VERDICT_WORD: Record<VerdictKind, string> = {
  within: "Within limits",
  low: "Low",
  high: "High",
  marginal: "Marginal — re-measured",
};

export const HAZARD_WORD: Record<string, string> = {
  electrical: "Line voltage",
  "stored-energy": "Stored charge",
  gas: "Gas",
  "hot-oil": "Hot oil",
  "hot-surface": "Hot surface",
  steam: "Steam",
  "moving-parts": "Moving parts",
  other: "Other hazard",
};

export function reportNumber(n: number): string {
  return `R-${String(n).padStart(4, "0")}`;
}
