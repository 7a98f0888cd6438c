// The invented demo scenario: a kitchen-equipment service shop in an invented town, and a second
// shop that exists so isolation between shops can be seen and tested. No real names anywhere.
import type { Role } from "../app/lib/roles";

export const DEMO_PASSWORD = "ember-valve-4821";

export const DEMO_SHOP = { key: "shop:tinderbox", name: "Tinderbox Kitchen Repair", town: "Ostley Ford" };
export const OTHER_SHOP = { key: "shop:pellham", name: "Pellham Cross Range Service", town: "Pellham Cross" };

export type DemoUser = { email: string; name: string; role: Role; shop: "demo" | "other" };

export const DEMO_USERS: DemoUser[] = [
  { email: "tech@tinderbox.example", name: "Priya Lindqvist", role: "technician", shop: "demo" },
  { email: "lead@tinderbox.example", name: "Teodor Vance", role: "lead", shop: "demo" },
  { email: "trainer@tinderbox.example", name: "Ines Calloway", role: "trainer", shop: "demo" },
  { email: "owner@tinderbox.example", name: "Maren Holt", role: "owner", shop: "demo" },
  { email: "owner@pellham.example", name: "Rafe Dunmore", role: "owner", shop: "other" },
  { email: "tech@pellham.example", name: "Odile Marsh", role: "technician", shop: "other" },
];

export type DemoUnit = {
  key: string;
  category: string;
  make: string;
  model: string;
  serial: string;
  installedOn: string;
  nameplate: Record<string, { value: number; unit: string }>;
};
export type DemoSite = { key: string; name: string; address: string; contactName: string; contactEmail: string; units: DemoUnit[] };
export type DemoCustomer = { key: string; name: string; phone: string; shop: "demo" | "other"; sites: DemoSite[] };

export const DEMO_CUSTOMERS: DemoCustomer[] = [
  {
    key: "cust:larkspur",
    name: "Larkspur Market",
    phone: "555-0141",
    shop: "demo",
    sites: [
      {
        key: "site:larkspur-deli",
        name: "Larkspur Market — Deli counter",
        address: "14 Quarry Lane, Ostley Ford",
        contactName: "Hal Brennick",
        contactEmail: "deli@larkspur.example",
        units: [
          {
            key: "unit:larkspur-rotisserie",
            category: "rotisserie",
            make: "Vantor",
            model: "RCF-2208 two-fan convection rotisserie",
            serial: "VR22-004417",
            installedOn: "2021-03-09",
            nameplate: { supply: { value: 208, unit: "V" }, power: { value: 5600, unit: "W" }, rated_uf: { value: 1.5, unit: "µF" } },
          },
          {
            key: "unit:larkspur-hotcase",
            category: "hot-holding",
            make: "Caldra",
            model: "HHC-12 heated display case",
            serial: "CH12-88120",
            installedOn: "2019-11-21",
            nameplate: { supply: { value: 120, unit: "V" }, power: { value: 1320, unit: "W" } },
          },
        ],
      },
    ],
  },
  {
    key: "cust:hollin",
    name: "Hollin Street School District",
    phone: "555-0178",
    shop: "demo",
    sites: [
      {
        key: "site:hollin-central",
        name: "Hollin Street Central Kitchen",
        address: "2 Foundry Road, Ostley Ford",
        contactName: "Wren Addabbo",
        contactEmail: "kitchen@hollin-schools.example",
        units: [
          {
            key: "unit:hollin-fryer",
            category: "fryer",
            make: "Quellmark",
            model: "GF-40N gas fryer",
            serial: "QM40-1120-77",
            installedOn: "2018-08-14",
            nameplate: { rated_manifold: { value: 3.5, unit: "inWC" } },
          },
          {
            key: "unit:hollin-oven",
            category: "oven",
            make: "Brenmoor",
            model: "EO-6 electric deck oven",
            serial: "BM6-55031",
            installedOn: "2020-01-30",
            nameplate: { supply: { value: 208, unit: "V" }, power: { value: 6000, unit: "W" } },
          },
        ],
      },
    ],
  },
  {
    key: "cust:gilded",
    name: "The Copper Lantern Bistro",
    phone: "555-0193",
    shop: "demo",
    sites: [
      {
        key: "site:gilded-line",
        name: "Copper Lantern — Cook line",
        address: "88 Weir Street, Ostley Ford",
        contactName: "Jules Farrant",
        contactEmail: "chef@copperlantern.example",
        units: [
          {
            key: "unit:gilded-griddle",
            category: "griddle",
            make: "Brenmoor",
            model: "EG-36 electric griddle",
            serial: "BG36-20417",
            installedOn: "2022-06-02",
            nameplate: { supply: { value: 240, unit: "V" }, power: { value: 10800, unit: "W" } },
          },
        ],
      },
    ],
  },
  {
    key: "cust:pellham-diner",
    name: "Pellham Cross Diner",
    phone: "555-0112",
    shop: "other",
    sites: [
      {
        key: "site:pellham-diner",
        name: "Pellham Cross Diner — Kitchen",
        address: "5 Mill Row, Pellham Cross",
        contactName: "Bo Tarrant",
        contactEmail: "owner@pellhamdiner.example",
        units: [
          {
            key: "unit:pellham-fryer",
            category: "fryer",
            make: "Quellmark",
            model: "GF-30L gas fryer (LP)",
            serial: "QM30-0021-02",
            installedOn: "2017-05-11",
            nameplate: { rated_manifold: { value: 10, unit: "inWC" } },
          },
        ],
      },
    ],
  },
];

export function demoLoginsText(): string {
  const rows = DEMO_USERS.map((u) => `    ${u.role.padEnd(11)} ${u.email.padEnd(27)} ${u.shop === "other" ? "(second shop)" : ""}`);
  return [`  Demo sign-ins (password for all: ${DEMO_PASSWORD}):`, ...rows].join("\n");
}

// --- Field runs: the shop's meters and open service calls (invented) ------------------------------

export type DemoMeter = {
  key: string;
  name: string;
  quantity: string;
  unit: string;
  rangeMax: number;
  resolution: number;
  percent: number;
  counts: number;
};

/** One row per meter function and range, with the accuracy printed in its (invented) manual. */
export const DEMO_METERS: DemoMeter[] = [
  {
    key: "meter:van1-volts",
    name: "Van 1 multimeter — AC volts, 600 V range",
    quantity: "voltage",
    unit: "V",
    rangeMax: 600,
    resolution: 0.1,
    percent: 1,
    counts: 3,
  },
  {
    key: "meter:van1-cap",
    name: "Van 1 multimeter — capacitance, 100 µF range",
    quantity: "capacitance",
    unit: "µF",
    rangeMax: 100,
    resolution: 0.01,
    percent: 1.9,
    counts: 2,
  },
  {
    key: "meter:van1-ohms",
    name: "Van 1 multimeter — resistance, 600 Ω range",
    quantity: "resistance",
    unit: "Ω",
    rangeMax: 600,
    resolution: 0.1,
    percent: 0.9,
    counts: 2,
  },
  {
    key: "meter:bench-lcr",
    name: "Bench LCR meter — capacitance, 2000 nF range",
    quantity: "capacitance",
    unit: "nF",
    rangeMax: 2000,
    resolution: 1,
    percent: 0.5,
    counts: 2,
  },
  {
    key: "meter:probe-thermo",
    name: "Probe thermometer",
    quantity: "temperature",
    unit: "°C",
    rangeMax: 300,
    resolution: 0.1,
    percent: 0.5,
    counts: 5,
  },
];

export type DemoCall = {
  key: string;
  number: number;
  unit: string;
  symptom: string;
  priority: "low" | "normal" | "high" | "urgent";
  assignedTo: string | null;
  notes?: string;
  shop: "demo" | "other";
};

export const DEMO_CALLS: DemoCall[] = [
  {
    key: "call:larkspur-uneven",
    number: 1041,
    unit: "unit:larkspur-rotisserie",
    symptom: "heats unevenly",
    priority: "high",
    assignedTo: "tech@tinderbox.example",
    notes: "Deli manager says the left spits come out pale by the lunch rush. Counter opens at 7:00.",
    shop: "demo",
  },
  {
    key: "call:hollin-fryer",
    number: 1042,
    unit: "unit:hollin-fryer",
    symptom: "slow to recover temperature after a basket drop",
    priority: "normal",
    assignedTo: "tech@tinderbox.example",
    shop: "demo",
  },
  {
    key: "call:gilded-griddle",
    number: 1043,
    unit: "unit:gilded-griddle",
    symptom: "right-hand section stays cold",
    priority: "urgent",
    assignedTo: null,
    shop: "demo",
  },
  {
    key: "call:pellham-fryer",
    number: 2001,
    unit: "unit:pellham-fryer",
    symptom: "pilot will not stay lit",
    priority: "high",
    assignedTo: "tech@pellham.example",
    shop: "other",
  },
];
